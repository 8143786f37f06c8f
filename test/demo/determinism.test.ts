import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { generateDemoShop } from '../../demo-data/generator/index.ts';
import { SMALL } from './reference.ts';

const FILES = ['items.csv', 'customers.csv', 'signals.csv', 'truth.json'];
const root = mkdtempSync(join(tmpdir(), 'demo-determinism-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const sha256 = (file: string) => createHash('sha256').update(readFileSync(file)).digest('hex');

/** sha256 of each file, via Node's crypto (FIPS 180-4), so equality means byte-identical files. */
async function digests(seed: number, name: string): Promise<string[]> {
  const outDir = join(root, name);
  await generateDemoShop({ seed, ...SMALL, outDir });
  return FILES.map((f) => sha256(join(outDir, f)));
}

/** The pictures folder as name -> sha256 of its bytes. */
function pictureDigests(outDir: string): Record<string, string> {
  return Object.fromEntries(readdirSync(join(outDir, 'pictures')).sort().map((f) => [f, sha256(join(outDir, 'pictures', f))]));
}

describe('generateDemoShop determinism', () => {
  it('writes byte-identical files for the same seed', async () => {
    const a = await digests(11, 'a');
    const b = await digests(11, 'b');
    expect(b).toEqual(a);
  });

  it('writes different files for a different seed', async () => {
    const a = await digests(11, 'c');
    const other = await digests(12, 'd');
    for (let k = 0; k < FILES.length; k++) expect(other[k], FILES[k]).not.toBe(a[k]);
  });

  it('draws byte-identical pictures for the same seed, and other colourings for another seed', async () => {
    const a = pictureDigests(join(root, 'a'));
    expect(Object.keys(a)).toHaveLength(72); // 12 categories × 6 colourings
    expect(pictureDigests(join(root, 'b'))).toEqual(a);
    const other = pictureDigests(join(root, 'd'));
    expect(Object.keys(other)).toEqual(Object.keys(a));
    expect(Object.values(other).filter((h, k) => h === Object.values(a)[k])).toEqual([]);
  });

  it('uses seed 7 when none is given', async () => {
    const outDir = join(root, 'default-seed');
    const summary = await generateDemoShop({ ...SMALL, outDir });
    expect(summary.seed).toBe(7);
    const truth = JSON.parse(readFileSync(join(outDir, 'truth.json'), 'utf8')) as { seed: number };
    expect(truth.seed).toBe(7);
  });
});

describe('generateDemoShop on a failed write', () => {
  it('leaves an existing shop as it was and no partial files behind', async () => {
    const outDir = join(root, 'failing');
    mkdirSync(outDir, { recursive: true });
    for (const f of FILES) writeFileSync(join(outDir, f), 'old\n');
    // A directory where the last file's temporary copy must go makes that write fail (EISDIR).
    mkdirSync(join(outDir, 'truth.json.partial'));
    await expect(generateDemoShop({ seed: 11, ...SMALL, outDir })).rejects.toThrow(/EISDIR|directory/i);
    for (const f of FILES) expect(readFileSync(join(outDir, f), 'utf8'), f).toBe('old\n');
    // No pictures folder, nor its temporary stand-in, is left behind.
    expect(readdirSync(outDir).sort()).toEqual([...FILES, 'truth.json.partial'].sort());
  });
});
