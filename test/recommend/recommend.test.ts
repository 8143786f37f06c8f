import fs from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { BLEND_MODELS } from '../../src-main/core/eval/index.ts';
import { readCustomerList, recommend, RECOMMEND_CSV_HEADER } from '../../src-main/services/recommend.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { handWorkspace, storeModels, tempDir } from '../holdout/fixture.ts';

let dir: string;
let db: Db;
const OWNED: Record<string, string[]> = { u1: ['i1', 'i2'], u2: ['i1', 'i3'], u3: ['i1', 'i2', 'i4'], u4: ['i2', 'i4'] };

beforeAll(async () => {
  dir = tempDir('recommend');
  ({ db } = await handWorkspace(dir));
  storeModels(db, ['content', 'itemknn', 'popularity']);
});
afterAll(() => {
  db?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

type Line = { customer: string; rank: number; item: string; score: number; contributions: Record<string, number>; sponsored: boolean };
const readJsonl = (f: string): Line[] => fs.readFileSync(f, 'utf8').trim().split('\n').map((l) => JSON.parse(l) as Line);

describe('recommend (per-customer top-N)', () => {
  it("never lists a customer's own items, ranks by score, and the contributions add up to the score", () => {
    const out = path.join(dir, 'all.jsonl');
    const r = recommend(db, { all: true, n: 5, out });
    expect(r.customers).toBe(4);
    const lines = readJsonl(out);
    expect(r.rows).toBe(lines.length);
    // 7 items minus 2-3 owned leaves at least 4 per customer; n = 5 caps the rest.
    for (const [c, owned] of Object.entries(OWNED)) {
      const mine = lines.filter((l) => l.customer === c);
      expect(mine.length).toBe(Math.min(5, 7 - owned.length));
      expect(mine.map((l) => l.rank)).toEqual(mine.map((_, q) => q + 1));
      for (const l of mine) expect(owned).not.toContain(l.item);
      for (let q = 1; q < mine.length; q++) expect(mine[q]!.score).toBeLessThanOrEqual(mine[q - 1]!.score);
      for (const l of mine) {
        const sum = BLEND_MODELS.reduce((s, k) => s + l.contributions[k]!, 0);
        expect(sum).toBeCloseTo(l.score, 5);
      }
    }
  });

  it('breaks ties by the lower external id (i10 before i6: code-unit order), as documented', () => {
    const out = path.join(dir, 'ties.jsonl');
    recommend(db, { customers: ['u3'], n: 4, out });
    const mine = readJsonl(out);
    const i6 = mine.find((l) => l.item === 'i6');
    const i10 = mine.find((l) => l.item === 'i10');
    expect(i6 && i10).toBeTruthy();
    expect(i10!.score).toBe(i6!.score); // twins: same title, category, tags, no signals
    expect(i10!.rank).toBeLessThan(i6!.rank);
  });

  it('reaches an item nobody interacted with through content (cold start)', () => {
    const out = path.join(dir, 'cold.jsonl');
    recommend(db, { customers: ['u1'], n: 1, out });
    // u1 has the two "Moss" garden items; i5 (Moss planter, outdoor/lamp/seat) shares their words and tags but
    // has no signals: only content can vouch for it. No blend is stored here (models stored by hand), so the
    // hybrid is item-kNN with the content path for cold items, and i5's whole score is content's.
    const [top] = readJsonl(out);
    expect(top!.item).toBe('i5');
    expect(top!.contributions['content']).toBeGreaterThan(0);
    expect(top!.contributions['content']).toBe(top!.score);
    expect(top!.contributions['itemknn']).toBe(0);
  });

  it('writes identical files on two runs (determinism), CSV with the documented header', () => {
    const a = path.join(dir, 'a.csv');
    const b = path.join(dir, 'b.csv');
    recommend(db, { all: true, n: 3, out: a });
    recommend(db, { all: true, n: 3, out: b });
    expect(fs.readFileSync(a)).toEqual(fs.readFileSync(b));
    const rows = parse(fs.readFileSync(a, 'utf8'), { columns: true }) as Record<string, string>[];
    expect(Object.keys(rows[0]!)).toEqual(RECOMMEND_CSV_HEADER);
    expect(rows).toHaveLength(12);
    // Lists per customer id are customer data: owner-only (POSIX mode 0600), as the workspace itself.
    if (process.platform !== 'win32') expect(fs.statSync(a).mode & 0o777).toBe(0o600);
  });

  it('reports unknown and repeated customers and writes the known ones', () => {
    const list = path.join(dir, 'customers.txt');
    fs.writeFileSync(list, 'customer\nu2\nghost\nu2\nu4\n');
    const ids = readCustomerList(list);
    expect(ids).toEqual(['u2', 'ghost', 'u2', 'u4']);
    const r = recommend(db, { customers: ids, n: 2, out: path.join(dir, 'some.csv') });
    expect(r.customers).toBe(2);
    expect(r.duplicateCustomers).toBe(1);
    expect(r.unknownCustomers).toEqual({ distinct: 1, rows: 1, examples: ['ghost'] });
  });

  it('replaces an older export of its own, CSV or JSON Lines, but no other file, a link to one, or an empty file', () => {
    for (const name of ['again.csv', 'again.jsonl']) {
      const out = path.join(dir, name);
      recommend(db, { all: true, n: 2, out });
      recommend(db, { customers: ['u1'], n: 1, out }); // a second run over the first: allowed
      expect(fs.readFileSync(out, 'utf8')).toContain('u1');
      expect(fs.readFileSync(out, 'utf8')).not.toContain('u2');
    }
    // The issue-11 exploit: a customer id becomes a line of a file the caller chose. Any file that is not an
    // export keeps its bytes, whatever its name says; so does an empty one (a marker file's existence matters).
    const others: [string, string][] = [
      ['notes.csv', 'customer;rank\nmine\n'],
      ['config.jsonl', '{"customer":"u1"}\n'],
      ['empty.csv', ''],
    ];
    for (const [name, text] of others) {
      const victim = path.join(dir, name);
      fs.writeFileSync(victim, text);
      expect(() => recommend(db, { customers: ['u1'], n: 1, out: victim }), name).toThrow(/will not overwrite this file: it is not a top-N export written by Shelfwright/);
      expect(fs.readFileSync(victim, 'utf8')).toBe(text);
    }
    const link = path.join(dir, 'link.csv');
    fs.symlinkSync(path.join(dir, 'notes.csv'), link);
    expect(() => recommend(db, { customers: ['u1'], n: 1, out: link })).toThrow(/through a link/);
    expect(fs.readlinkSync(link)).toBe(path.join(dir, 'notes.csv'));
    expect(fs.readdirSync(dir).some((f) => f.includes('.partial-'))).toBe(false);
  });

  it('refuses a bad top and leaves no partial file behind a failed write', () => {
    expect(() => recommend(db, { all: true, n: 0, out: path.join(dir, 'x.csv') })).toThrow(InputError);
    const missing = path.join(dir, 'no-such-dir', 'x.csv');
    expect(() => recommend(db, { all: true, n: 2, out: missing })).toThrow(/cannot write the output file/);
    expect(fs.readdirSync(dir).some((f) => f.includes('.partial-'))).toBe(false);
  });
});
