/**
 * Novelty as mean self-information, Zhou, Kuscsik, Liu, Medo, Wakeling & Zhang (2010), "Solving the
 * apparent diversity-accuracy dilemma of recommender systems", PNAS 107(10), eq. for novelty:
 *
 *   novelty(L) = (1 / |L|) Σ_{i ∈ L} −log2 p_i,   p_i = (customers who have item i) / (all customers)
 *
 * averaged over all recommended lists (every recommended item weighs the same). Higher = less obvious.
 * Edge cases: an item nobody has would have infinite surprise; its count is clipped to 1, i.e. the
 * largest finite value log2(customers) — an unseen item is as novel as the rarest seen one, no more.
 * No customers is a caller's error (RangeError). Lists with no items give NaN. Entries of -1 are skipped.
 */
export function selfInformation(customersWithItem: number, customerCount: number): number {
  if (!(customerCount >= 1)) throw new RangeError(`customerCount must be >= 1, got ${customerCount}`);
  const c = Math.min(customerCount, Math.max(1, customersWithItem));
  return Math.log2(customerCount / c); // = −log2 p, written so p = 1 gives +0
}

export function novelty(
  lists: readonly ArrayLike<number>[],
  customersWithItem: ArrayLike<number>,
  customerCount: number,
): number {
  let s = 0;
  let n = 0;
  for (const list of lists) {
    for (let r = 0; r < list.length; r++) {
      const i = list[r]!;
      if (i < 0) continue;
      const c = customersWithItem[i];
      if (c === undefined) throw new RangeError(`item index ${i} has no customer count`);
      s += selfInformation(c, customerCount);
      n++;
    }
  }
  return n === 0 ? Number.NaN : s / n;
}
