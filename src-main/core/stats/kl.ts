/**
 * Relative entropy (Kullback–Leibler divergence), Cover & Thomas, Elements of Information Theory,
 * definition 2.3: D(p‖q) = Σ_x p(x) log(p(x) / q(x)), with 0·log(0/q) = 0 and p·log(p/0) = ∞.
 * Natural logarithm (nats): Steck (2018) leaves the base open; only comparisons between shelves matter.
 * Both inputs must already be distributions over the same outcomes (same length).
 */
export function klDivergence(p: ArrayLike<number>, q: ArrayLike<number>): number {
  if (p.length !== q.length) throw new RangeError(`klDivergence: lengths differ (${p.length} vs ${q.length})`);
  let d = 0;
  for (let x = 0; x < p.length; x++) {
    const px = p[x] as number;
    if (px <= 0) continue;
    const qx = q[x] as number;
    if (qx <= 0) return Infinity;
    d += px * Math.log(px / qx);
  }
  return d;
}

/** The mixing weight of Steck (2018), "Calibrated recommendations", section 2.1: q̃ = (1 − α)q + αp. */
export const CALIBRATION_ALPHA = 0.01;

/**
 * Miscalibration C_KL(p, q) = KL(p‖q̃), q̃ = (1 − α)q + αp (Steck 2018, eq. 2 and the smoothing below it):
 * p is the target (the audience's category mix), q the list's. Mixing in a little of p keeps the value
 * finite when the list misses a category the audience has. Inputs are normalised here; a zero total
 * on either side gives NaN (no data).
 */
export function calibrationGap(p: ArrayLike<number>, q: ArrayLike<number>, alpha = CALIBRATION_ALPHA): number {
  if (p.length !== q.length) throw new RangeError(`calibrationGap: lengths differ (${p.length} vs ${q.length})`);
  if (!(alpha >= 0 && alpha <= 1)) throw new RangeError(`calibrationGap: alpha must be in [0, 1], got ${alpha}`);
  let sp = 0;
  let sq = 0;
  for (let x = 0; x < p.length; x++) {
    sp += p[x] as number;
    sq += q[x] as number;
  }
  if (!(sp > 0) || !(sq > 0)) return NaN;
  let d = 0;
  for (let x = 0; x < p.length; x++) {
    const px = (p[x] as number) / sp;
    if (px <= 0) continue;
    const qt = (1 - alpha) * ((q[x] as number) / sq) + alpha * px;
    d += px * Math.log(px / qt);
  }
  return d;
}
