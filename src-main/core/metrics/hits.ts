/**
 * The shared input of the binary ranking metrics: which of the first k ranked items are relevant.
 * Metrics take this "hit vector" (hits[r] = 1 when rank r + 1 is relevant) plus the number of relevant
 * items, so the evaluator can fill one reused Uint8Array per customer and call every metric without
 * allocating; `hitsAtK` is the convenience form for a ranked list and a truth set.
 */
export function hitsAtK(ranked: ArrayLike<number>, truth: ReadonlySet<number>, k: number): Uint8Array {
  checkK(k);
  const n = Math.min(k, ranked.length);
  const hits = new Uint8Array(n);
  for (let r = 0; r < n; r++) hits[r] = truth.has(ranked[r]!) ? 1 : 0;
  return hits;
}

/** Number of relevant items among the first min(k, hits.length) ranks. */
export function hitCount(hits: ArrayLike<number>, k: number): number {
  const n = Math.min(k, hits.length);
  let c = 0;
  for (let r = 0; r < n; r++) if (hits[r]) c++;
  return c;
}

/** Cut-offs are positive integers; a zero or fractional K is a caller's mistake, not an empty list. */
export function checkK(k: number): void {
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`K must be an integer >= 1, got ${k}`);
}
