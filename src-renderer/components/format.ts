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
