/**
 * How far a ban reaches, and what a new edition copied from an earlier one takes with it.
 *
 *   shelf          this shelf of this edition only
 *   edition        every shelf of this edition only
 *   later          every shelf of this edition, and of every edition copied from it dated on or after it
 *   until:DATE     as `later`, for copies dated up to and including DATE (YYYY-MM-DD)
 *   always         every shelf of every edition, copied or not (the store's global reach; never copied)
 *
 * `later` and `until:` travel with a copy ("edition new --from"): the copied shelf gets the ban as its own,
 * so it can be lifted there while the earlier edition (perhaps published, read-only) keeps its own.
 */
import { InputError } from '../errors.ts';

export type BanScope = 'shelf' | 'edition' | 'later' | 'always' | `until:${string}`;

export const PLAIN_SCOPES = ['shelf', 'edition', 'later', 'always'] as const;

const UNTIL = /^until:(\d{4}-\d{2}-\d{2})$/;

/** The last date an `until:` scope reaches, or null for the other scopes. */
export function untilDate(scope: BanScope): string | null {
  return UNTIL.exec(scope)?.[1] ?? null;
}

function realDate(d: string): boolean {
  const t = Date.parse(`${d}T00:00:00Z`);
  return !Number.isNaN(t) && new Date(t).toISOString().slice(0, 10) === d;
}

/**
 * Checks a scope as an editor gives it, against the date of the edition the ban is made in: an `until`
 * date before that edition would ban nothing anywhere.
 */
export function checkScope(scope: string, editionDate: string): BanScope {
  if ((PLAIN_SCOPES as readonly string[]).includes(scope)) return scope as BanScope;
  const m = UNTIL.exec(scope);
  if (!m || !realDate(m[1]!)) {
    throw new InputError(
      `Where the ban holds (scope): must be shelf, edition, later, always or until:YYYY-MM-DD with a real date, got '${scope}'`,
    );
  }
  if (m[1]! < editionDate) {
    throw new InputError(`Where the ban holds (scope): ${m[1]} is before this edition's date ${editionDate}; choose a date on or after it`);
  }
  return scope as BanScope;
}

/** Whether a ban made in an edition dated `from` comes along into a copy dated `to`. */
export function carriesTo(scope: BanScope, from: string, to: string): boolean {
  if (scope === 'later') return to >= from;
  const until = untilDate(scope);
  return until !== null && to >= from && to <= until;
}

/** Whether the ban reaches every shelf of its own edition (all but `shelf`). */
export function editionWide(scope: BanScope): boolean {
  return scope !== 'shelf';
}

/** The scope in words, as the editor chose it. */
export function scopeWords(scope: BanScope): string {
  switch (scope) {
    case 'shelf':
      return 'this shelf';
    case 'edition':
      return 'this edition';
    case 'later':
      return 'this edition and later';
    case 'always':
      return 'always';
    default:
      return `this edition and later, until ${untilDate(scope) ?? '?'}`;
  }
}
