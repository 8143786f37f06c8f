/**
 * "More like these anchors" through the validated blend (issue 10 item 4; DESIGN.md "Two kinds of score").
 *
 * Why a pseudo-history: every model in the blend already answers "what goes with a customer who has these
 * items" (item-kNN and EASE sum their item-to-item rows over the history, content averages its neighbour
 * lists, iALS folds a new customer in by eq. (4) of Hu, Koren & Volinsky 2008, popularity ignores it), and
 * the blend was validated on exactly that question. So the anchors are handed to the blend as the history of
 * one customer nobody has seen, and each model's scores are normalised per the blend's own normalisation
 * (standardised or ranks, the anchors left out of the statistics as a customer's history is) and weighted by
 * the blend's weights; cold items keep the content path when the blend keeps it. The alternative — the mean
 * of one model's similarity rows — would answer with whichever model the shelf happened to load, not with the
 * blend that won on held-out data.
 *
 * Every anchor enters with the value of one purchase (DEFAULT_KIND_WEIGHTS): an editor's anchor says
 * "these belong together" as firmly as a sale does. Models on presence (item-kNN, EASE, content) ignore the
 * value; it sets iALS's confidence for the fold-in.
 */
import type { Csr } from '../matrix/csr.ts';
import { DEFAULT_KIND_WEIGHTS } from '../matrix/build.ts';
import { InputError } from '../errors.ts';
import type { BlendScorer } from './blend-scorer.ts';

/**
 * A history matrix whose only non-empty row, `row`, lists `anchors` (deduplicated, ascending) with `value`.
 * `row` must lie beyond every trained customer, so a factor model folds the row in instead of reading a
 * trained customer's vector.
 */
export function anchorHistory(anchors: ArrayLike<number>, row: number, items: number, value = DEFAULT_KIND_WEIGHTS.purchase): Csr {
  const cols = [...new Set(Array.from(anchors))].sort((a, b) => a - b);
  for (const a of cols) if (!(Number.isInteger(a) && a >= 0 && a < items)) throw new InputError(`anchor item index ${a} is outside 0..${items - 1}`);
  const indptr = new Int32Array(row + 2);
  indptr[row + 1] = cols.length;
  return { rows: row + 1, cols: items, indptr, indices: Int32Array.from(cols), data: new Float32Array(cols.length).fill(value) };
}

/**
 * The validated blend's relevance of every item for a customer whose history is the anchors, into `out`
 * (catalogue length). `trainedRows` is the number of customer rows the blend's models know (the history
 * matrix's rows): the pseudo-customer takes the row after every one of them. The anchors themselves are
 * left at the lowest score (a shelf about them does not propose them again).
 */
export function anchorRelevanceInto(blend: BlendScorer, anchors: ArrayLike<number>, trainedRows: number, out: Float32Array): void {
  if (out.length !== blend.itemCount) throw new InputError(`anchor relevance: expected ${blend.itemCount} items, got ${out.length}`);
  // A factor model trained on more customers than the matrix now has (never expected) must still fold in.
  let row = trainedRows;
  for (const p of blend.parts) {
    const c = (p.scorer as { customerCount?: unknown }).customerCount;
    if (typeof c === 'number' && c > row) row = c;
  }
  const history = anchorHistory(anchors, row, blend.itemCount);
  blend.scoreInto(row, history, out);
  let min = Infinity;
  for (let i = 0; i < out.length; i++) if (out[i]! < min) min = out[i]!;
  for (let p = 0; p < history.indices.length; p++) out[history.indices[p]!] = min;
}
