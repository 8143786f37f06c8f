/**
 * "1 row", "2 rows", "12,400 signals": a count with its noun in the right number, for messages people
 * read. Digits are grouped with commas (en-US), as the rest of the command line prints numbers.
 */
export function plural(n: number, singular: string, pluralForm = `${singular}s`): string {
  return `${n.toLocaleString('en-US')} ${n === 1 ? singular : pluralForm}`;
}
