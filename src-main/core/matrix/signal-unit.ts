import { SIGNAL_KINDS, type Dataset, type SignalKind } from '../types.ts';
import { resolveKindWeights } from './build.ts';

/**
 * What one ordinary signal weighs in the interaction matrix: the kind weight of the most frequent kind among the
 * signals that carry weight (ties: the lighter kind). 1 when there are none.
 *
 * Why: the matrix's values are kind weights × quantities (build.ts), so their unit is arbitrary — a shop of
 * purchases only has every value 5× what the same shop logged as "other" would have. Linear confidence and
 * presence do not care (α absorbs a constant), but the log confidence of iALS, c = 1 + α·log(1 + r/ε) (Hu, Koren &
 * Volinsky 2008, from memory), does: with ε = 1, one purchase reads log 6 where one view reads log 2. Taking ε in
 * this unit makes r/ε a count of ordinary signals, as in the paper (r = how often), and makes the fit the same
 * whatever the kind weights' scale. Measured on Online Retail (purchases only, unit 5; bench:quality, NDCG@20
 * on test after `train --tune --k 20`): iALS 0.0952 with ε = 1, 0.0960 with ε = 5.
 */
export function signalUnit(ds: Dataset, kindWeights?: Partial<Record<SignalKind, number>>): number {
  const w = resolveKindWeights(kindWeights);
  const counts = new Float64Array(SIGNAL_KINDS.length);
  const kinds = ds.signals.kind;
  for (let k = 0; k < kinds.length; k++) counts[kinds[k]!]!++;
  let best = -1;
  for (let c = 0; c < counts.length; c++) {
    if (!(counts[c]! > 0) || !(w[c]! > 0)) continue;
    if (best < 0 || counts[c]! > counts[best]! || (counts[c] === counts[best] && w[c]! < w[best]!)) best = c;
  }
  return best < 0 ? 1 : w[best]!;
}
