/**
 * The cluster round trip through the command line, as a data team would run it: export signals, a model
 * folder in Spark's layout (written by DuckDB from the exported signals' own ids), import model, then the
 * commands that curate on it: models (where it came from), recommend, propose, audience groups, evaluate.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from '../cli/capture.ts';
import { importSmallShop } from '../cli/small-shop.ts';
import { tempDir } from '../holdout/fixture.ts';
import { writeSparkModelDir, range } from './spark-fixture.ts';

let dir: string;
let ws: string;

async function run(...argv: string[]) {
  const io = capture();
  const code = await main([...argv, '-w', ws], io, {});
  return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
}

beforeAll(async () => {
  dir = tempDir('cli-cluster');
  ws = path.join(dir, 'w.sqlite');
  await importSmallShop(ws, dir, 7);
}, 60_000);
afterAll(() => {
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('shelfwright export signals / import model', () => {
  it('exports, imports a rank-16 model and curates on it', async () => {
    const out = path.join(dir, 'export');
    const e = await run('export', 'signals', '--format', 'parquet', '--out', out);
    expect(e.code, e.err).toBe(0);
    expect(e.out).toMatch(/^wrote [\d,]+ signals of 400 customers on 120 items into /);
    const manifest = JSON.parse(fs.readFileSync(path.join(out, 'shelfwright-export.json'), 'utf8')) as { customers: number; items: number };
    await writeSparkModelDir(path.join(out, 'model'), {
      rank: 16,
      users: { ids: range(manifest.customers), rank: 16, parts: 3 },
      items: { ids: range(manifest.items), rank: 16 },
    });
    const i = await run('import', 'model', path.join(out, 'model'));
    expect(i.code, i.err).toBe(0);
    expect(i.out).toMatch(/^imported the iALS model: trained on a cluster \(Spark 3\.5\.1 ALS\), imported \d{4}-\d\d-\d\d, rank 16$/);

    const m = await run('models');
    expect(m.code, m.err).toBe(0);
    expect(m.out).toMatch(/ials: trained on a cluster \(Spark 3\.5\.1 ALS\), imported .*, rank 16/);
    expect(m.out).toMatch(/ials .* current/);

    const top = path.join(dir, 'top.jsonl');
    const rec = await run('recommend', '--all', '--top', '3', '--out', top);
    expect(rec.code, rec.err).toBe(0);
    expect(fs.readFileSync(top, 'utf8').trim().split('\n')).toHaveLength(400 * 3);
    const groups = await run('audience', 'groups', '--json');
    expect(groups.code, groups.err).toBe(0);
    const p = await run('propose', '--n', '5', '--json');
    expect(p.code, p.err).toBe(0);
    const ev = await run('evaluate', '--k', '5', '--json');
    expect(ev.code, ev.err).toBe(0);
    expect(ev.out).toContain('"model": "ials"');
  }, 120_000);

  it('refuses --format other than parquet, and a non-empty output folder', async () => {
    expect((await run('export', 'signals', '--format', 'csv', '--out', path.join(dir, 'x'))).err).toMatch(/--format must be parquet, got 'csv'/);
    const again = await run('export', 'signals', '--format', 'parquet', '--out', path.join(dir, 'export'));
    expect(again.code).toBe(2);
    expect(again.err).toMatch(/export: the folder is not empty/);
  });

  it('says which file is not a model', async () => {
    const r = await run('import', 'model', path.join(dir, 'export', 'items'));
    expect(r.code).toBe(2);
    expect(r.err).toBe(`shelfwright import model: ${path.join(dir, 'export', 'items')}: not a saved Spark model: it has no metadata/ folder (ALSModel.save writes metadata/, userFactors/ and itemFactors/)`);
  });
});
