/**
 * Catalogue coverage: the share of the catalogue that appears in at least one recommended list
 * (Herlocker, Konstan, Terveen & Riedl 2004, "Evaluating collaborative filtering recommender systems",
 * "catalog coverage"). A popularity list scores low here however accurate it is.
 *
 *   coverage = |∪ lists| / itemCount ∈ [0, 1]
 *
 * Edge cases: an empty catalogue is a caller's error (RangeError); no lists gives 0. Entries of -1
 * (an unfilled slot) are ignored.
 */
export function catalogueCoverage(lists: readonly ArrayLike<number>[], itemCount: number): number {
  if (!Number.isInteger(itemCount) || itemCount < 1) throw new RangeError(`itemCount must be >= 1, got ${itemCount}`);
  const seen = new Uint8Array(itemCount);
  let distinct = 0;
  for (const list of lists) {
    for (let r = 0; r < list.length; r++) {
      const i = list[r]!;
      if (i < 0) continue;
      if (i >= itemCount) throw new RangeError(`item index ${i} outside a catalogue of ${itemCount}`);
      if (seen[i] === 0) {
        seen[i] = 1;
        distinct++;
      }
    }
  }
  return distinct / itemCount;
}
