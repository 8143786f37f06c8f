import { describe, expect, it } from 'vitest';
import { READINGS, SHELF_READING_KEYS } from '../../src-main/core/curation/readings.ts';
import { parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import type { EditionSnapshot } from '../../src-main/core/editing/snapshot.ts';
import { exportEdition } from '../../src-main/services/export/index.ts';
import { seededCli } from './seeded-cli.ts';

describe('the meter in exports', () => {
  it('carries every reading by the names the app and the command line use, with range and target', async () => {
    const { run } = seededCli();
    await run('edition', 'new', 'w', '--date', '2026-03-02');
    await run('shelf', 'add', 'w', 'Front', '--size', '5');
    await run('shelf', 'targets', 'w', 'Front', '--novelty', '0.2:0.6');
    const json = await run('edition', 'export', 'w', '--format', 'json');
    const doc = JSON.parse(json.out);
    const meter = doc.shelves[0].meter as { reading: string; name: string; value: number | null; range: string; target: object; targetText: string }[];
    expect(meter.map((r) => r.name)).toEqual(SHELF_READING_KEYS.map((k) => READINGS[k].name));
    const novelty = meter.find((r) => r.reading === 'novelty')!;
    expect(novelty).toMatchObject({ name: 'Novelty', range: '0–1', target: { min: 0.2, max: 0.6 }, targetText: 'target 0.20 to 0.60' });
    expect(novelty.value).toBeGreaterThanOrEqual(0);
    expect(novelty.value).toBeLessThanOrEqual(1);
    const shown = await run('shelf', 'meter', 'w', 'Front');
    expect(shown.out).toMatch(new RegExp(`^Novelty +${novelty.value!.toFixed(2)} +0–1 +target 0\\.20 to 0\\.60`, 'm'));
    const html = await run('edition', 'export', 'w', '--format', 'html');
    expect(html.out).toContain(`<dt>Novelty</dt><dd>${novelty.value!.toFixed(2)} (0–1)</dd><dd>target 0.20 to 0.60, `);
  });

  it('leaves out a meter stored before these scales rather than print it under their names', () => {
    // An edition published before the scales: its variety was Ziegler's raw 0–2 distance, novelty in bits.
    const old = { intraListDistance: 1.02, novelty: 5.6, calibrationGap: 2.9, age: { medianDays: 10, shareUnder30Days: 0 } };
    const snap: EditionSnapshot = {
      edition: { id: 1, label: 'old', date: '2026-01-05' },
      publishedAt: 1,
      shelves: [{ label: 'Front', position: 0, brief: parseBrief({ size: 1 }), meter: old as never, violations: [], slots: [] }],
      editionMeter: null,
    };
    expect(JSON.parse(exportEdition(snap, 'json')).shelves[0].meter).toBeNull();
    expect(exportEdition(snap, 'html')).not.toContain('Variety');
  });
});
