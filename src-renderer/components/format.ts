/** Display helpers. A reading with no data arrives as null and is shown as a dash with a reason in words. */
export const NO_DATA = '—';

export function pct(v: number | null | undefined, digits = 0): string {
  return v === null || v === undefined ? NO_DATA : `${(v * 100).toFixed(digits)}%`;
}

export function num(v: number | null | undefined, digits = 2): string {
  return v === null || v === undefined ? NO_DATA : v.toFixed(digits);
}

export function days(v: number | null | undefined): string {
  return v === null || v === undefined ? NO_DATA : `${Math.round(v)} d`;
}

/** Today as YYYY-MM-DD in the editor's own time zone (an edition date is a calendar date). */
export function today(d = new Date()): string {
  const m = String(d.getMonth() + 1).padStart(2, '0');
  const day = String(d.getDate()).padStart(2, '0');
  return `${d.getFullYear()}-${m}-${day}`;
}

/** Whole numbers in the editor's locale, with its thousands separators (Intl; the browser's language). */
const counts = new Intl.NumberFormat(undefined, { maximumFractionDigits: 0 });
export function count(n: number | null | undefined): string {
  return n === null || n === undefined || !Number.isFinite(n) ? NO_DATA : counts.format(n);
}

/** Numbers in reasons (core/curation/reason-words.ts) as the screen shows them. */
export const screenNumbers = { count: (n: number) => count(n) };

/**
 * An item's place in its pool: "3 of 1,204". The rank is 1 + the candidates scoring higher (ties share the
 * best place), so any two different scores read differently, which "top 1%" never did for a shelf drawn
 * from the head of a large pool.
 */
export function rankWords(rank: number | null | undefined, poolSize: number): string {
  if (rank === null || rank === undefined) return 'not in the pool';
  return `${count(rank)} of ${count(poolSize)} in the pool`;
}

/**
 * The one date format on screen: the editor's locale (Intl.DateTimeFormat, e.g. "7 Dec 2026" or
 * "Dec 7, 2026"); exports keep ISO 8601 (YYYY-MM-DD). A calendar date (an edition's, "YYYY-MM-DD") is read
 * and shown in UTC so it never shifts a day with the time zone; a moment (unix ms: published, trained) is
 * shown in the editor's own time zone, with its time.
 */
const calendarDay = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'UTC' });
const moment = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });
const ISO_DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

export function dateWords(day: string | null | undefined): string {
  if (day === null || day === undefined || day === '') return NO_DATA;
  const m = ISO_DAY.exec(day);
  if (!m) return day; // not a calendar date: shown as it came, never guessed at
  return calendarDay.format(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
}

/** A calendar day given as unix ms at UTC midnight (the store's dates), in the screen's one format. */
export function dayWords(ms: number | null | undefined): string {
  return ms === null || ms === undefined || !Number.isFinite(ms) ? NO_DATA : calendarDay.format(ms);
}

export function momentWords(ms: number | null | undefined): string {
  return ms === null || ms === undefined || !Number.isFinite(ms) ? NO_DATA : moment.format(ms);
}

/** A file's name without its folders (either separator: the workspace may be on Windows). */
export function fileName(file: string): string {
  return file.split(/[\\/]/).pop() || file;
}
