import { describe, expect, it } from 'vitest';
import { plural } from '../../src-main/core/util/plural.ts';

describe('plural', () => {
  it('uses the singular for exactly one and the plural otherwise, zero included', () => {
    expect([0, 1, 2].map((n) => plural(n, 'row'))).toEqual(['0 rows', '1 row', '2 rows']);
    expect(plural(1, 'customer created', 'customers created')).toBe('1 customer created');
    expect(plural(12_400, 'signal')).toBe('12,400 signals');
    expect(plural(3, 'category', 'categories')).toBe('3 categories');
  });
});
