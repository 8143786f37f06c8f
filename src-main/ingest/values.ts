import { SIGNAL_KINDS, type SignalKind } from '../core/types.ts';
import { cut, quote } from '../core/util/cut.ts';

/**
 * Cell converters shared by every target. Each returns the value or a `Bad` with the reason an editor
 * should read; none throws, so one bad cell rejects one row and the import goes on to report the rest.
 */
export interface Bad {
  readonly bad: string;
}
export const isBad = (v: unknown): v is Bad => typeof v === 'object' && v !== null && 'bad' in v;
const bad = (reason: string): Bad => ({ bad: reason });

export type DateOrder = 'dmy' | 'mdy';

/** Empty means "not given": '' / whitespace from CSV, null or undefined from JSON. */
export function isBlank(v: unknown): boolean {
  return v === undefined || v === null || (typeof v === 'string' && v.trim() === '');
}

export function text(v: unknown): string | Bad {
  if (typeof v === 'string') return v;
  if (typeof v === 'number' || typeof v === 'boolean') return String(v);
  return bad(`expected text, got ${describe(v)}`);
}

const TRUE = new Set(['true', 'yes', 'y', '1']);
const FALSE = new Set(['false', 'no', 'n', '0']);
export function bool(v: unknown): boolean | Bad {
  if (typeof v === 'boolean') return v;
  if (typeof v === 'number' && (v === 0 || v === 1)) return v === 1;
  if (typeof v === 'string') {
    const s = v.trim().toLowerCase();
    if (TRUE.has(s)) return true;
    if (FALSE.has(s)) return false;
  }
  return bad(`expected true/false, yes/no, y/n or 1/0, got ${describe(v)}`);
}

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const COMMA_DECIMAL = /^[+-]?\d+,\d+$/;
/**
 * A finite number >= 0 (prices and signal values are never negative here). A decimal comma ("12,50") is
 * read only when the file's delimiter is not a comma, where it cannot be a thousands separator in a
 * quoted cell by mistake.
 */
export function nonNegative(v: unknown, commaDecimal: boolean): number | Bad {
  let n: number;
  if (typeof v === 'number') n = v;
  else if (typeof v === 'string') {
    const s = v.trim();
    if (DECIMAL.test(s)) n = Number(s);
    else if (commaDecimal && COMMA_DECIMAL.test(s)) n = Number(s.replace(',', '.'));
    else return bad(`not a number: ${describe(v)}${s.includes(',') ? ' (use a dot as decimal separator)' : ''}`);
  } else return bad(`not a number: ${describe(v)}`);
  // '1e999' reads as Infinity (IEEE 754 binary64 overflows past about 1.8e308), in CSV text or JSON alike.
  if (!Number.isFinite(n)) return bad(`out of range: ${describe(v)}; numbers go up to about 1.8e308`);
  if (n < 0) return bad(`must not be negative: ${describe(v)}`);
  return n;
}

/** Kind words as shops write them; anything else is rejected so a typo never becomes 'other'. */
const KIND_SYNONYMS: Readonly<Record<string, SignalKind>> = {
  cart: 'basket', addtocart: 'basket', addtobasket: 'basket', basketadd: 'basket',
  buy: 'purchase', order: 'purchase', sale: 'purchase', bought: 'purchase', transaction: 'purchase',
  rate: 'rating', review: 'rating', stars: 'rating',
  pageview: 'view', impression: 'view', visit: 'view', viewed: 'view',
  reading: 'read', open: 'read', opened: 'read',
  clicked: 'click', tap: 'click',
};
const CANONICAL_KINDS: ReadonlySet<string> = new Set(SIGNAL_KINDS);
export function kind(v: unknown): SignalKind | Bad {
  if (typeof v !== 'string') return bad(`expected a kind, got ${describe(v)}`);
  if (CANONICAL_KINDS.has(v)) return v as SignalKind; // the usual case: no trimming or lower-casing to do
  const s = v.trim().toLowerCase();
  if ((SIGNAL_KINDS as readonly string[]).includes(s)) return s as SignalKind;
  const k = KIND_SYNONYMS[s.replace(/[\s_-]/g, '')];
  return k ?? bad(`unknown kind ${describe(v)}; expected one of ${SIGNAL_KINDS.join(', ')}`);
}

/** Tags from '|' lists (or ';' where the CSV delimiter is ','), or a JSON array of strings. Trimmed, deduplicated. */
export function tags(v: unknown, alsoSemicolon: boolean): string[] | Bad {
  let parts: unknown[];
  if (Array.isArray(v)) parts = v;
  else if (typeof v === 'string') parts = v.split(alsoSemicolon ? /[|;]/ : '|');
  else return bad(`expected a tag list, got ${describe(v)}`);
  const out: string[] = [];
  for (const p of parts) {
    if (typeof p !== 'string') return bad(`tags must be text, got ${describe(p)}`);
    const t = p.trim();
    if (t !== '' && !out.includes(t)) out.push(t);
  }
  return out;
}

// ISO 8601 calendar date, optionally with time (T or space) and zone; no zone means UTC (our rule).
const ISO = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?(Z|[+-]\d{2}(?::?\d{2})?)?)?$/;
const SLASH = /^(\d{1,2})\/(\d{1,2})\/(\d{4})(?:[ T](\d{1,2}):(\d{2})(?::(\d{2}))?)?$/;
const DIGITS = /^\d{1,16}$/;
/**
 * Below this a unix number is read as seconds, from it on as milliseconds: 1e11 s is the year 5138, while
 * 1e11 ms is March 1973, so real data never sits on the wrong side (common practice, no source).
 */
const SECONDS_LIMIT = 1e11;

/**
 * The years a date may have: ISO 8601's four-digit years end at 9999 (a later year needs the expanded
 * form, by prior agreement: ISO 8601-1:2019 section 4.3.2), and years before 1000 are refused too: no
 * shop's history reaches back that far, and `Date.UTC` reads years 0-99 as 1900-1999, which once stored
 * '0099-01-01' as 1999 (common practice, no source, for the lower bound).
 */
export const FIRST_YEAR = 1000;
export const LAST_YEAR = 9999;
const YEARS = `years run from ${FIRST_YEAR} to ${LAST_YEAR}`;
/** The last instant of LAST_YEAR, as unix ms. */
const LAST_MS = Date.UTC(LAST_YEAR, 11, 31, 23, 59, 59, 999);

/** A time as unix ms UTC. Slash dates are ambiguous (3/4/2026) and need an explicit `dateOrder`. */
export function time(v: unknown, dateOrder: DateOrder | undefined): number | Bad {
  if (typeof v === 'number') return unixNumber(v, v);
  if (typeof v !== 'string') return bad(`expected a date, got ${describe(v)}`);
  const fast = isoUtcSeconds(v);
  if (fast >= 0) return fast;
  const s = v.trim();
  if (DIGITS.test(s)) return unixNumber(Number(s), v);
  let m = ISO.exec(s);
  if (m) {
    const [, y, mo, d, h, mi, sec, frac, zone] = m;
    const ms = frac ? Math.floor(Number(`0.${frac}`) * 1000) : 0;
    const at = civil(+y!, +mo!, +d!, h ? +h : 0, mi ? +mi : 0, sec ? +sec : 0, ms);
    if (isBad(at)) return bad(`${at.bad}: ${describe(v)}`);
    return zone ? at - zoneOffsetMs(zone) : at;
  }
  m = SLASH.exec(s);
  if (m) {
    if (!dateOrder) return bad(`ambiguous date ${describe(v)}: day first or month first? Choose the date order, dmy or mdy (--date-order on the command line)`);
    const [, a, b, y, h, mi, sec] = m;
    const [d, mo] = dateOrder === 'dmy' ? [+a!, +b!] : [+b!, +a!];
    const at = civil(+y!, mo, d, h ? +h : 0, mi ? +mi : 0, sec ? +sec : 0, 0);
    return isBad(at) ? bad(`${at.bad}: ${describe(v)} (read as ${dateOrder})`) : at;
  }
  return bad(`not a date: ${describe(v)}; use ISO 8601 (2026-03-14 or 2026-03-14T09:26:53Z) or unix seconds`);
}

/**
 * Fast path for the commonest log form, 'YYYY-MM-DDTHH:MM:SSZ' (exactly 20 characters), read with char codes
 * instead of a regex and Date.UTC: date parsing was a third of the CSV parse time on 1M signals (profiled).
 * Returns -1 for anything else, including out-of-range fields, so the general path reports the error.
 * Day count from the civil date by Howard Hinnant's days_from_civil ("chrono-Compatible Low-Level Date
 * Algorithms"), proleptic Gregorian as unix time uses.
 */
function isoUtcSeconds(s: string): number {
  if (s.length !== 20 || s.charCodeAt(10) !== 84 || s.charCodeAt(19) !== 90) return -1; // 'T' ... 'Z'
  if (s.charCodeAt(4) !== 45 || s.charCodeAt(7) !== 45 || s.charCodeAt(13) !== 58 || s.charCodeAt(16) !== 58) return -1;
  const c = twoDigits(s, 0);
  const yy = twoDigits(s, 2);
  const mo = twoDigits(s, 5);
  const d = twoDigits(s, 8);
  const h = twoDigits(s, 11);
  const mi = twoDigits(s, 14);
  const sec = twoDigits(s, 17);
  if (c < 0 || yy < 0 || mo < 1 || mo > 12 || d < 1 || h < 0 || h > 23 || mi < 0 || mi > 59 || sec < 0 || sec > 59) return -1;
  const y = c * 100 + yy;
  if (y < FIRST_YEAR) return -1;
  const leap = y % 4 === 0 && (y % 100 !== 0 || y % 400 === 0);
  if (d > (mo === 2 ? (leap ? 29 : 28) : MONTH_DAYS[mo - 1]!)) return -1;
  const yr = mo <= 2 ? y - 1 : y;
  const era = Math.floor(yr / 400);
  const yoe = yr - era * 400;
  const doy = Math.floor((153 * (mo + (mo > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  const days = era * 146097 + doe - 719468;
  return days * 86_400_000 + h * 3_600_000 + mi * 60_000 + sec * 1000;
}
const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** The two decimal digits at `i` as a number, or -1. Top level, not a closure: one per call showed up in profiles. */
function twoDigits(s: string, i: number): number {
  const a = s.charCodeAt(i) - 48;
  const b = s.charCodeAt(i + 1) - 48;
  return a >= 0 && a <= 9 && b >= 0 && b <= 9 ? a * 10 + b : -1;
}

function unixNumber(n: number, raw: unknown): number | Bad {
  if (n === Number.POSITIVE_INFINITY) return bad(`year out of range: ${describe(raw)}; ${YEARS}`);
  if (!Number.isFinite(n) || n < 0 || !Number.isInteger(n)) return bad(`not a unix time: ${describe(raw)}`);
  const ms = n < SECONDS_LIMIT ? n * 1000 : n;
  return ms > LAST_MS ? bad(`year out of range: ${describe(raw)} as unix milliseconds is after the year ${LAST_YEAR}; ${YEARS}`) : ms;
}

function civil(y: number, mo: number, d: number, h: number, mi: number, s: number, ms: number): number | Bad {
  if (y < FIRST_YEAR || y > LAST_YEAR) return bad(`year ${y} out of range (${YEARS})`);
  if (mo < 1 || mo > 12) return bad('month out of range');
  const days = new Date(Date.UTC(y, mo, 0)).getUTCDate();
  if (d < 1 || d > days) return bad('day out of range');
  // 24:00 is ISO 8601's end of day; 60 seconds would be a leap second, which unix time cannot hold.
  if (h > 24 || (h === 24 && (mi > 0 || s > 0 || ms > 0)) || mi > 59 || s > 59) return bad('time out of range');
  return Date.UTC(y, mo - 1, d) + h * 3_600_000 + mi * 60_000 + s * 1000 + ms;
}

function zoneOffsetMs(zone: string): number {
  if (zone === 'Z') return 0;
  const sign = zone[0] === '-' ? -1 : 1;
  const digits = zone.slice(1).replace(':', '');
  return sign * (Number(digits.slice(0, 2)) * 3_600_000 + Number(digits.slice(2) || '0') * 60_000);
}

/** The value as an editor would recognise it in a message, cut (core/util/cut.ts). */
export function describe(v: unknown): string {
  if (v === undefined) return 'nothing';
  if (typeof v === 'string') return quote(v);
  // JSON.stringify would say null for these (JSON has no Infinity): a JSON file's 1e999 arrives as Infinity.
  if (typeof v === 'number' && !Number.isFinite(v)) return Number.isNaN(v) ? 'not a number' : `a number too large to hold (${v < 0 ? '-' : ''}1e999 or the like)`;
  return cut(JSON.stringify(v) ?? String(v));
}
