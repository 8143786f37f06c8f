/** The words every export uses for promoted items (in words, never colour alone: DESIGN.md). */
export const SPONSORED = 'Sponsored';

/** One line every list shown outside the tool carries. Disclosure rules are a matter of local law. */
export const DISCLOSURE_NOTE =
  'Items marked "Sponsored" are paid placements; rules on labelling sponsored placement differ by country, so follow local law and your own counsel.';

/**
 * A slot's percentile in every export on one scale, 0 to 100 (whole numbers), as the CSV's notes describe it;
 * the snapshot keeps the fill's 0–1 fraction.
 */
export function exportedPercentile(fraction: number | null): number | null {
  return fraction === null ? null : Math.round(fraction * 100);
}
