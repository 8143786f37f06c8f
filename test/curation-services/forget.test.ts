import { afterEach, describe, expect, it } from 'vitest';
import { forgetCustomer } from '../../src-main/services/forget.ts';
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
    expect(r).toEqual({ customer: 'C-7', signals: before, modelsDeleted: ['ials'], modelsStale: ['itemknn'] });
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
});
