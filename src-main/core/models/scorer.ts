import type { Csr } from '../matrix/csr.ts';

/** The model families Shelfwright trains. Names are the published methods'. */
/** 'random' is the evaluation baseline (randomScorer), never trained or stored as a workspace model. */
export type ModelKind = 'content' | 'itemknn' | 'ials' | 'ease' | 'popularity' | 'random';

export interface IterationProgress {
  iteration: number;
  iterations: number;
  elapsedMs: number;
  /** Training objective after this iteration, where the method has one. */
  loss?: number;
}

export interface FitOptions {
  /** Aborting throws CancelledError from the next iteration boundary. */
  signal?: AbortSignal;
  onIteration?: (p: IterationProgress) => void;
}

export interface FitReport {
  kind: ModelKind;
  elapsedMs: number;
  iterations?: number;
  losses?: number[];
  /** Anything the user should know about how the fit went (e.g. EASE restricted to the most active items). */
  notes: string[];
}

/** The n best entries, best first: dense item indices and their scores. */
export interface TopN {
  items: Int32Array;
  scores: Float32Array;
}

/**
 * The one interface every trained model offers the hybrid scorer and the evaluator
 * (STYLE.md: one interface per model, as in benfred/implicit's recommender_base).
 */
export interface Scorer {
  readonly kind: ModelKind;
  readonly itemCount: number;
  /**
   * Writes customer u's predicted preference for every item into `out` (length itemCount).
   * `history` is the interaction matrix the customer's row is read from (the training matrix in
   * evaluation, the full matrix in production); models that only need factors ignore it.
   */
  scoreInto(u: number, history: Csr, out: Float32Array): void;
  /** Writes the similarity of every item to item i into `out` (length itemCount); i itself gets 0. */
  similarityInto(i: number, out: Float32Array): void;
  /** The n items most similar to item i, best first, i excluded. */
  similarItems(i: number, n: number): TopN;
  /** A compact binary form for the workspace; `load<Model>(bytes)` restores it. */
  serialize(): Uint8Array;
}
