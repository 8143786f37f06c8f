import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { StringIdTable } from '../../src-main/core/util/string-id-table.ts';

/**
 * The importer's id table must answer exactly as a JavaScript Map would (the reference: ECMAScript's
 * Map, SameValueZero on strings) for any keys, including ones whose hashes share a slot.
 */
describe('StringIdTable', () => {
  it('agrees with Map on any sequence of sets and lookups, through every growth', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.string({ unit: 'binary', maxLength: 12 }), fc.nat()), { maxLength: 400 }),
        fc.array(fc.string({ unit: 'binary', maxLength: 12 }), { maxLength: 100 }),
        (writes, probes) => {
          const table = new StringIdTable();
          const map = new Map<string, number>();
          for (const [k, id] of writes) {
            table.set(k, id);
            map.set(k, id);
          }
          expect(table.size).toBe(map.size);
          for (const k of [...map.keys(), ...probes]) expect(table.get(k)).toBe(map.get(k) ?? -1);
          const { keys, ids } = table.entries();
          expect(keys).toEqual([...map.keys()]); // insertion order, as Map keeps it
          expect(ids).toEqual([...map.values()]);
        },
      ),
    );
  });

  it('finds every one of 100,000 keys and none of 100,000 others', () => {
    const keys = Array.from({ length: 100_000 }, (_, i) => `c${i}`);
    const table = StringIdTable.from(keys, keys.map((_, i) => i + 1));
    let found = 0;
    for (let i = 0; i < keys.length; i++) if (table.get(keys[i]!) === i + 1) found++;
    expect(found).toBe(100_000);
    let missing = 0;
    for (let i = 0; i < 100_000; i++) if (table.get(`c${i}x`) === -1 && !table.has(`x${i}`)) missing++;
    expect(missing).toBe(100_000);
  });

  it('tells apart keys that differ only in case, spacing or by a lone surrogate', () => {
    const table = StringIdTable.from(['A1', 'a1', ' a1', 'a1 ', '\uD800', '\uDC00'], [1, 2, 3, 4, 5, 6]);
    expect(['A1', 'a1', ' a1', 'a1 ', '\uD800', '\uDC00', 'a'].map((k) => table.get(k))).toEqual([1, 2, 3, 4, 5, 6, -1]);
  });

  it('refuses a negative row id (lookups use -1 for "absent")', () => {
    expect(() => new StringIdTable().set('x', -1)).toThrow(/non-negative/);
  });
});
