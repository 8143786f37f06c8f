/**
 * A share of n slots as a whole count, one rounding for every place that turns a share into slots (the fill, the
 * stable fill, the rotation planner): a cap rounds down and a floor rounds up, each with a 1e-9 allowance so a
 * share that is exactly k/n in decimal (0.25 × 24, 0.1 × 30) counts as k despite binary floating point.
 */
const EPS = 1e-9;

/** The most slots a share allows (`maxCount`, a supplier's or sponsored cap). */
export const capOf = (share: number, n: number): number => Math.floor(share * n + EPS);

/** The fewest slots a share asks for (`minCount`, a supplier's floor). */
export const floorOf = (share: number, n: number): number => Math.ceil(share * n - EPS);

/** A brief's promoted count bounds on n slots; an absent bound is no bound (0 and n). */
export function promotedCountBounds(promo: { minCount?: number; maxCount?: number }, n: number): { minCount: number; maxCount: number } {
  return {
    minCount: promo.minCount === undefined ? 0 : floorOf(promo.minCount, n),
    maxCount: promo.maxCount === undefined ? n : capOf(promo.maxCount, n),
  };
}
