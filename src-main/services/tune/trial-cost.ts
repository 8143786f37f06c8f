/**
 * What a tuning trial costs, predicted from the sizes of the data and of the setting, never measured (issue 10
 * item 5: a bounded budget; repeatable: the same data gives the same search on a loaded or an idle machine).
 *
 * Unit: estimated CPU milliseconds of one trial on the reference machine (the 2-core development machine these
 * coefficients were fitted on), fit plus measurement on the validation split. Only ratios matter to the search
 * (its budget is `budget` × the predicted cost of one plain fit of every searched model, so the machine's speed
 * cancels out); the coefficients set how the pool is shared between models and how a larger iALS or an item-kNN
 * keeping every neighbour is charged against a plain fit.
 *
 * Work terms (each from the method's own loops):
 * - measurement: every validation customer is scored over the catalogue and ranked (V·n), plus each model's
 *   per-customer scoring: item-kNN Σ_h k over the history, EASE |h|·n (a dense row of B per history item),
 *   iALS n·k (a dot product per item).
 * - item-kNN (Sarwar et al. 2001): co-occurrences Σ_u |r_u|² and the kept neighbour lists n·k.
 * - EASE (Steck 2019): the Gram matrix Σ_u |r_u|² and its inverse, n³.
 * - iALS per sweep (Hu et al. 2008 §4, CG per Takács et al. 2011): the k × k Gram products of every row,
 *   (m + n)·k², and CG's passes over the observed entries, nnz·k.
 *
 * Coefficients: least squares by eye over start fits measured with process.cpuUsage on the two data sets at
 * hand, 2026-12-05 (load average 5-6): the demo shop's validation split (15,000 × 2,500, 164k entries) and the
 * Online Retail log's (4,097 × 3,624, 190k entries), 1,000 validation customers each. Predicted against
 * measured CPU-ms (demo; Online Retail): item-kNN k 50 133 vs 105-166, 285 vs 258-299; k = every item 331 vs
 * 245-262, 1,355 vs 1,391-1,426; EASE 744 vs 725-773, 2,355 vs 1,988-2,111; iALS 3 sweeps at 64 factors 1,139
 * vs 1,191-1,310, 1,230 vs 984-1,061; at 128 factors 2,598 vs 2,852-2,864, 2,489 vs 1,975-2,034.
 * Within about 25% everywhere, which is all a budget needs; the trials chosen depend on these constants and the
 * sizes only.
 */
import { nnz, type Csr } from '../../core/matrix/csr.ts';

/** Reference CPU-ms per unit of each work term (per million units, as written). */
const PER_MILLION = {
  rank: 44, // V·n: scoring and ranking the catalogue for each validation customer
  pairs: 3.8, // Σ_u |r_u|²: co-occurrence / Gram accumulation
  neighbours: 6, // n·k + V·h̄·k: item-kNN's neighbour lists and scoring through them
  easeScore: 2.5, // V·h̄·n: EASE scoring through dense rows of B
  cube: 0.035, // n³: EASE's inverse
  ialsGram: 1, // (m + n)·k² per sweep
  ialsEntries: 22, // nnz·k per sweep
  ialsScore: 0.75, // V·n·k: iALS scoring
} as const;

/** The sizes a cost depends on: the validation split's train matrix and the customers measured. */
export interface CostSizes {
  rows: number;
  cols: number;
  nnz: number;
  /** Σ over customers of (distinct items)²: the co-occurrence pairs of item-kNN and EASE's Gram. */
  pairs: number;
  /** Validation customers measured. */
  customers: number;
}

export function costSizes(train: Csr, customers: number): CostSizes {
  let pairs = 0;
  for (let u = 0; u < train.rows; u++) {
    const r = train.indptr[u + 1]! - train.indptr[u]!;
    pairs += r * r;
  }
  return { rows: train.rows, cols: train.cols, nnz: nnz(train), pairs, customers };
}

const M = 1e6;

/** Mean history length of a measured customer (the train matrix's mean row). */
const meanHistory = (s: CostSizes) => (s.rows > 0 ? s.nnz / s.rows : 0);

export function itemKnnCost(s: CostSizes, k: number): number {
  const kk = Math.min(k, s.cols);
  return (
    (PER_MILLION.rank * s.customers * s.cols +
      PER_MILLION.pairs * s.pairs +
      PER_MILLION.neighbours * (s.cols * kk + s.customers * meanHistory(s) * kk)) /
    M
  );
}

/**
 * A trial that reuses a fit and only measures (a profile half-life: it weighs the customer's row in scoring, so the
 * fitted weights are those of a trial already run, model-search.ts): the measurement terms of easeCost.
 */
export function easeScoreCost(s: CostSizes): number {
  return (PER_MILLION.rank * s.customers * s.cols + PER_MILLION.easeScore * s.customers * meanHistory(s) * s.cols) / M;
}

/** itemKnnCost's measurement terms only (a trial reusing a fit, as easeScoreCost). */
export function itemKnnScoreCost(s: CostSizes, k: number): number {
  const kk = Math.min(k, s.cols);
  return (PER_MILLION.rank * s.customers * s.cols + PER_MILLION.neighbours * s.customers * meanHistory(s) * kk) / M;
}

export function easeCost(s: CostSizes): number {
  return (
    (PER_MILLION.rank * s.customers * s.cols +
      PER_MILLION.pairs * s.pairs +
      PER_MILLION.cube * s.cols ** 3 +
      PER_MILLION.easeScore * s.customers * meanHistory(s) * s.cols) /
    M
  );
}

/** One iALS sweep at `factors` (without the measurement). */
export function ialsSweepCost(s: CostSizes, factors: number): number {
  return (PER_MILLION.ialsGram * (s.rows + s.cols) * factors * factors + PER_MILLION.ialsEntries * s.nnz * factors) / M;
}

/** An iALS trial: `sweeps` sweeps at `factors`, then the measurement. */
export function ialsCost(s: CostSizes, factors: number, sweeps: number): number {
  return sweeps * ialsSweepCost(s, factors) + (PER_MILLION.rank * s.customers * s.cols + PER_MILLION.ialsScore * s.customers * s.cols * factors) / M;
}

/**
 * A popularity trial (a recent-popularity half-life, half-life-search.ts): one pass over the entries, then the
 * measurement, whose per-customer work is copying the scores (part of the ranking term).
 */
export function popularityCost(s: CostSizes): number {
  return (PER_MILLION.rank * s.customers * s.cols + PER_MILLION.pairs * s.nnz) / M;
}

/**
 * Content's plain fit and measurement: its neighbour lists through the inverted index (Σ_f df_f² candidate
 * updates, the same accumulation as co-occurrence pairs; content.ts contentNeighbours) and a measurement. The
 * text pass (tokens, TF-IDF), linear in the catalogue's text, is left out.
 */
export function contentCost(s: CostSizes, postingPairs: number): number {
  return (PER_MILLION.pairs * postingPairs) / M + contentScoreCost(s, postingPairs);
}

/**
 * A content trial (a profile half-life: the item vectors are fitted once, half-life-search.ts): the measurement,
 * whose per-customer work is the profile's pass through the inverted index, at most h̄ · (Σ_f df_f²) / n
 * multiply-adds (each history item's features, each feature's postings; shared features make it less), charged at
 * EASE's dense-row rate (the same multiply-add into a row of scores).
 */
export function contentScoreCost(s: CostSizes, postingPairs: number): number {
  const perCustomer = Math.min(meanHistory(s) * (s.cols > 0 ? postingPairs / s.cols : 0), meanHistory(s) * s.cols);
  return (PER_MILLION.rank * s.customers * s.cols + PER_MILLION.easeScore * s.customers * perCustomer) / M;
}
