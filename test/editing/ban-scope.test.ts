/**
 * What each ban scope carries into a copied edition (core/editing/ban-scope.ts). The expectations follow the
 * scopes' definitions as the editor reads them on screen; dates are compared as ISO 8601 calendar dates
 * (YYYY-MM-DD sorts as text in date order: ISO 8601-1:2019, 5.2.2 complete representation).
 */
import { describe, expect, it } from 'vitest';
import { carriesTo, checkScope, editionWide, scopeWords, untilDate } from '../../src-main/core/editing/ban-scope.ts';

describe('ban scopes', () => {
  it('this shelf and this edition only never come along into a copy; always reaches by itself, not by copying', () => {
    for (const s of ['shelf', 'edition', 'always'] as const) expect(carriesTo(s, '2026-03-02', '2026-03-09')).toBe(false);
  });

  it('this edition and later comes along into copies dated on or after its edition, never before', () => {
    expect(carriesTo('later', '2026-03-02', '2026-03-09')).toBe(true);
    expect(carriesTo('later', '2026-03-02', '2026-03-02')).toBe(true);
    expect(carriesTo('later', '2026-03-02', '2026-02-23')).toBe(false);
  });

  it('until a date comes along up to and including that date', () => {
    const s = checkScope('until:2026-03-31', '2026-03-02');
    expect(untilDate(s)).toBe('2026-03-31');
    expect(carriesTo(s, '2026-03-02', '2026-03-30')).toBe(true);
    expect(carriesTo(s, '2026-03-02', '2026-03-31')).toBe(true);
    expect(carriesTo(s, '2026-03-02', '2026-04-01')).toBe(false);
    // Across a year end the text order is still the date order.
    expect(carriesTo(checkScope('until:2027-01-04', '2026-12-28'), '2026-12-28', '2027-01-04')).toBe(true);
  });

  it('refuses an unknown scope, an impossible date and a date before the edition', () => {
    expect(() => checkScope('forever', '2026-03-02')).toThrow("must be shelf, edition, later, always or until:YYYY-MM-DD with a real date, got 'forever'");
    expect(() => checkScope('until:2026-02-30', '2026-02-01')).toThrow(/real date/);
    expect(() => checkScope('until:2026-03-01', '2026-03-02')).toThrow("2026-03-01 is before this edition's date 2026-03-02");
  });

  it('says each scope in words and reaches every shelf of its edition but for this shelf', () => {
    expect(['shelf', 'edition', 'later', 'always', 'until:2026-03-31'].map((s) => scopeWords(checkScope(s, '2026-03-02')))).toEqual([
      'this shelf',
      'this edition',
      'this edition and later',
      'always',
      'this edition and later, until 2026-03-31',
    ]);
    expect(editionWide('shelf')).toBe(false);
    expect(editionWide('later')).toBe(true);
  });
});
