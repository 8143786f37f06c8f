import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bool, isBad, kind, nonNegative, tags, time } from '../../src-main/ingest/values.ts';

const reason = (v: unknown) => (isBad(v) ? v.bad : `no error (got ${String(v)})`);

describe('time', () => {
  it('reads ISO 8601 dates and date-times; no zone means UTC', () => {
    // 946684800 s is 2000-01-01T00:00:00Z, the well-known unix time of that instant (from memory, and
    // ECMA-262's Date.parse agrees below).
    expect(time('2000-01-01', undefined)).toBe(946_684_800_000);
    expect(time('2000-01-01T00:00:00Z', undefined)).toBe(946_684_800_000);
    expect(time('2000-01-01T00:00:00', undefined)).toBe(946_684_800_000);
    expect(time('2000-01-01 01:30:00+01:30', undefined)).toBe(946_684_800_000);
    expect(time('1999-12-31T19:00:00-0500', undefined)).toBe(946_684_800_000);
    expect(time('2026-03-14T09:26:53.250Z', undefined)).toBe(Date.UTC(2026, 2, 14, 9, 26, 53, 250));
  });
  it('agrees with ECMA-262 Date.parse on the Date Time String Format (section 21.4.1.32) with explicit zones', () => {
    // External reference: ECMAScript's own ISO parser. We add Z where ECMAScript would read local time.
    for (const s of ['2026-03-14T09:26:53Z', '2024-02-29T23:59:59.999Z', '1970-01-01T00:00:00Z', '2026-12-31T12:00:00+05:30']) {
      expect(time(s, undefined)).toBe(Date.parse(s));
    }
    expect(time('2026-03-14', undefined)).toBe(Date.parse('2026-03-14')); // date-only forms are UTC in ECMA-262 too
  });
  it('reads unix seconds and milliseconds', () => {
    expect(time('1773480413', undefined)).toBe(1_773_480_413_000);
    expect(time('1773480413000', undefined)).toBe(1_773_480_413_000);
    expect(time(1773480413, undefined)).toBe(1_773_480_413_000);
  });
  it('refuses slash dates without a dateOrder and reads them with one', () => {
    expect(reason(time('03/04/2026', undefined))).toMatch(/day first or month first\? Choose the date order, dmy or mdy/);
    expect(time('03/04/2026', 'dmy')).toBe(Date.UTC(2026, 3, 3));
    expect(time('03/04/2026', 'mdy')).toBe(Date.UTC(2026, 2, 4));
    expect(reason(time('13/25/2026', 'mdy'))).toMatch(/month out of range/);
  });
  it('refuses impossible and unreadable dates', () => {
    expect(reason(time('2026-02-30', undefined))).toMatch(/day out of range/);
    expect(reason(time('2025-02-29', undefined))).toMatch(/day out of range/);
    expect(time('2024-02-29', undefined)).toBe(Date.UTC(2024, 1, 29)); // 2024 is a leap year (Gregorian rule)
    expect(reason(time('2026-13-01', undefined))).toMatch(/month out of range/);
    expect(reason(time('2026-03-14T25:00:00Z', undefined))).toMatch(/time out of range/);
    expect(reason(time('next tuesday', undefined))).toMatch(/not a date/);
    expect(reason(time('-5', undefined))).toMatch(/not a date|unix/);
  });
});

describe('bool, numbers, kinds, tags', () => {
  it('reads the agreed boolean words and nothing else', () => {
    for (const t of ['true', 'TRUE', 'yes', 'Y', '1', 1, true]) expect(bool(t)).toBe(true);
    for (const f of ['false', 'no', 'N', '0', 0, false]) expect(bool(f)).toBe(false);
    expect(reason(bool('maybe'))).toMatch(/expected true\/false/);
  });
  it('rejects negative and non-numeric values; reads a decimal comma only when asked', () => {
    expect(nonNegative('12.50', false)).toBe(12.5);
    expect(nonNegative('1e3', false)).toBe(1000);
    expect(reason(nonNegative('-3', false))).toMatch(/must not be negative/);
    expect(reason(nonNegative('abc', false))).toMatch(/not a number/);
    expect(reason(nonNegative('12,50', false))).toMatch(/decimal separator/);
    expect(nonNegative('12,50', true)).toBe(12.5);
    expect(reason(nonNegative('Infinity', false))).toMatch(/not a number/);
  });
  it('maps kind synonyms and refuses unknown kinds', () => {
    expect(kind('cart')).toBe('basket');
    expect(kind('Add_to_cart')).toBe('basket');
    expect(kind('buy')).toBe('purchase');
    expect(kind('ORDER')).toBe('purchase');
    expect(kind('rating')).toBe('rating');
    expect(reason(kind('wishlisted'))).toMatch(/unknown kind/);
  });
  it("splits tags on '|' and also ';' when asked, trimmed and deduplicated", () => {
    expect(tags('a| b |a||c', false)).toEqual(['a', 'b', 'c']);
    expect(tags('a;b|c', false)).toEqual(['a;b', 'c']);
    expect(tags('a;b|c', true)).toEqual(['a', 'b', 'c']);
    expect(tags(['x', ' y '], false)).toEqual(['x', 'y']);
  });
});

describe('the fast path for YYYY-MM-DDTHH:MM:SSZ', () => {
  it('agrees with ECMA-262 Date.parse on random instants from 1970 to 2199 (fast-check property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: Date.UTC(2199, 11, 31, 23, 59, 59) / 1000 }), (sec) => {
        const iso = new Date(sec * 1000).toISOString().replace('.000Z', 'Z');
        expect(time(iso, undefined)).toBe(Date.parse(iso));
      }),
      { numRuns: 2000 },
    );
  });
  it('leaves impossible dates to the general path, which names the error', () => {
    expect(reason(time('2026-02-29T10:00:00Z', undefined))).toMatch(/day out of range/);
    expect(reason(time('2000-02-30T10:00:00Z', undefined))).toMatch(/day out of range/);
    expect(time('2000-02-29T10:00:00Z', undefined)).toBe(Date.UTC(2000, 1, 29, 10)); // 2000 is a leap year (400 rule)
    expect(reason(time('1900-02-29T10:00:00Z', undefined))).toMatch(/day out of range/); // 1900 is not (100 rule)
    expect(reason(time('2026-03-14T24:30:00Z', undefined))).toMatch(/time out of range/);
  });
});
