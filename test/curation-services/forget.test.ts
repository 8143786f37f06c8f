import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { forgetCustomer } from '../../src-main/services/forget.ts';
import { importFile } from '../../src-main/services/import.ts';
import { erasureGeneration } from '../../src-main/store/erasure.ts';
import { dataFingerprint, modelStatus } from '../../src-main/store/models.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';

let db: Db | undefined;
afterEach(() => db?.close());

const count = (sql: string, ...p: unknown[]) => db!.prepare(sql).pluck().get(...p) as number;

describe('forget a customer', () => {
  it('erases the signals and the row, deletes per-customer models and leaves the rest stale', () => {
    ({ db } = openSeeded());
    const fp = dataFingerprint(db);
    // Plain SQL rather than ModelRepo.saveAll, so this test depends only on the model table's schema.
    const insert = db.prepare("INSERT INTO model (kind, fingerprint, trained_at, train_ms, bytes) VALUES (?, ?, 1, 1, x'010203')");
    insert.run('ials', fp);
    insert.run('itemknn', fp);
    expect(modelStatus(db).every((m) => !m.stale)).toBe(true);
    const before = count('SELECT count(*) FROM signal WHERE customer_id = 7');
    const total = count('SELECT count(*) FROM signal');
    expect(before).toBeGreaterThan(0);

    const r = forgetCustomer(db, 'C-7');
    expect(r).toMatchObject({ customer: 'C-7', signals: before, modelsDeleted: ['ials'], modelsStale: ['itemknn'], bytesRemoved: true });
    expect(r.message).toBe(
      `erased customer C-7: ${before} signals and the customer row; deleted the iALS model (it kept a row for every customer); ` +
        "the item-kNN model is out of date until you train again (trained with this customer's signals, though holding no row for them); " +
        'the workspace file was rewritten, so no trace of the erased rows is left in it',
    );
    expect(count('SELECT count(*) FROM customer WHERE external_id = ?', 'C-7')).toBe(0);
    expect(count('SELECT count(*) FROM signal WHERE customer_id = 7')).toBe(0);
    expect(count('SELECT count(*) FROM signal')).toBe(total - before);
    expect(count("SELECT count(*) FROM model WHERE kind = 'ials'")).toBe(0);
    expect(modelStatus(db).map((m) => [m.kind, m.stale])).toEqual([['itemknn', true]]);
  });

  it('names an unknown customer and changes nothing', () => {
    ({ db } = openSeeded());
    const total = count('SELECT count(*) FROM signal');
    expect(() => forgetCustomer(db!, 'C-999')).toThrow(/no customer with id 'C-999'/);
    expect(count('SELECT count(*) FROM signal')).toBe(total);
  });

  it('removes the id from the import log (file names and quoted cells) and leaves the other entries as they were', async () => {
    let file: string;
    ({ db, file } = openSeeded());
    const dir = path.dirname(file);
    const put = (name: string, text: string) => {
      fs.writeFileSync(path.join(dir, name), text);
      return path.join(dir, name);
    };
    // Signals arrive before the customer does: the log keeps "unknown customer 'C-31'" among its messages.
    const early = await importFile(db, {
      target: 'signals',
      file: put('week-9.csv', 'customer,item,kind,at\nC-5,SKU-001,view,2026-02-01\nC-31,SKU-002,view,2026-02-02\nC-5,SKU-003,view,yesterday\n'),
      acceptPartial: true,
    });
    expect(early.errors.map((e) => e.message).join('\n')).toMatch(/unknown customer 'C-31'/);
    await importFile(db, { target: 'customers', file: put('C-31 joined.csv', 'id\nC-31\n') });
    await importFile(db, { target: 'signals', file: put('week-10.csv', 'customer,item,kind,at\nC-31,SKU-002,view,2026-02-03\n') });
    const log = () => db!.prepare('SELECT file, report FROM import_log ORDER BY id').all() as { file: string; report: string }[];
    const before = log();
    expect(before.filter((l) => (l.file + l.report).includes('C-31'))).toHaveLength(2);

    const r = forgetCustomer(db, 'C-31');
    expect(r.importLogScrubbed).toBe(2);
    const after = log();
    expect(after.filter((l) => (l.file + l.report).includes('C-31'))).toEqual([]);
    expect(after[2]).toEqual(before[2]); // week-10.csv named no one in its log entry
    const errors = (JSON.parse(after[0]!.report) as { errors: { line: number; message: string }[] }).errors;
    // The message that named C-31 is replaced whole; its line stays, and the other customer's message is untouched.
    expect(errors.map((e) => [e.line, e.message])).toEqual([
      [3, '[removed: it named an erased customer]'],
      [4, expect.stringMatching(/yesterday/)],
    ]);
    expect(after[1]!.file).toBe('[removed: it named an erased customer]');
  });

  it('raises the erasure generation in the same transaction', () => {
    ({ db } = openSeeded());
    const g = erasureGeneration(db);
    forgetCustomer(db, 'C-3');
    expect(erasureGeneration(db)).toBe(g + 1);
    expect(() => forgetCustomer(db!, 'C-3')).toThrow(/no customer/);
    expect(erasureGeneration(db)).toBe(g + 1);
  });
});
