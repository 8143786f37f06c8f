import { orderInto } from './normalise.ts';
import { competitionRanksInto } from './rank.ts';
import { COMPONENT_COUNT, COMPONENTS, C_CONTENT, type Component } from './components.ts';

/** An item that drove a candidate's content or collaborative part, with its similarity. */
export interface Evidence {
  item: number;
  similarity: number;
}

/** One candidate with everything an editor may ask "why?" about. Items are dense indices. */
export interface ScoredItem {
  index: number;
  /** Blended score × multiplier. */
  score: number;
  /** Blended score before boost/sink, in [0, 1]. */
  blended: number;
  multiplier: number;
  /** Percentile of `score` within the pool, in [0, 1] (what editors see). */
  percentile: number;
  coldStart: boolean;
  /** Weight × normalised value per component; sums to `blended`. 0 for unavailable components. */
  contributions: Record<Component, number>;
  normalised: Record<Component, number>;
  /** Raw component values (on demand in the UI). */
  raw: Record<Component, number>;
  /** Up to 3 anchors per part, strongest first. A cold item's collaborative evidence is its content's. */
  evidence: { content: Evidence[]; collaborative: Evidence[] };
}

export interface PoolScoresParts {
  pool: Int32Array;
  anchors: Int32Array;
  available: boolean[];
  weights: Float64Array;
  raw: Float32Array;
  normalised: Float32Array;
  contributions: Float32Array;
  blended: Float32Array;
  multiplier: Float32Array;
  score: Float32Array;
  percentile: Float32Array;
  coldStart: Uint8Array;
  contentRows: Float32Array[];
  collaborativeRows: Float32Array[];
}

export const EVIDENCE_COUNT = 3;

/**
 * A scored pool in columns (position p = pool[p]); component arrays are component-major, value of
 * component c at position p is `x[c * n + p]`. Objects are built only for the positions asked for.
 */
export class PoolScores {
  readonly n: number;
  readonly pool: Int32Array;
  readonly anchors: Int32Array;
  /** Which components had something to say (e.g. content needs anchors). */
  readonly available: Record<Component, boolean>;
  /** Weights actually used, renormalised over the available components. */
  readonly weights: Record<Component, number>;
  readonly score: Float32Array;
  readonly blended: Float32Array;
  readonly percentile: Float32Array;
  readonly coldStart: Uint8Array;
  readonly contributions: Float32Array;
  readonly #p: PoolScoresParts;
  #ranks: Int32Array | undefined;

  constructor(parts: PoolScoresParts) {
    this.#p = parts;
    this.n = parts.pool.length;
    this.pool = parts.pool;
    this.anchors = parts.anchors;
    this.score = parts.score;
    this.blended = parts.blended;
    this.percentile = parts.percentile;
    this.coldStart = parts.coldStart;
    this.contributions = parts.contributions;
    this.available = record((j) => parts.available[j] === true);
    this.weights = record((j) => parts.weights[j]!);
  }

  /** Pool positions best first (score descending, then earlier pool position — the pool is in index order). */
  order(): Int32Array {
    const order = new Int32Array(this.n);
    orderInto(this.score, this.n, order, new Float64Array(this.n), true);
    return order;
  }

  /** Each pool position's rank by score, 1 = best, ties sharing the best place (rank.ts); made on first call. */
  ranks(): Int32Array {
    if (!this.#ranks) {
      this.#ranks = new Int32Array(this.n);
      competitionRanksInto(this.score, this.n, this.#ranks, new Float64Array(this.n));
    }
    return this.#ranks;
  }

  /** The explained candidate at pool position p. */
  explain(p: number): ScoredItem {
    const { n } = this;
    const parts = this.#p;
    const at = (x: Float32Array) => record((c) => x[c * n + p]!);
    const item = this.pool[p]!;
    const cold = this.coldStart[p] === 1;
    const content = topEvidence(parts.contentRows, this.anchors, item);
    const collaborative = cold && parts.available[C_CONTENT] ? content : topEvidence(parts.collaborativeRows, this.anchors, item);
    return {
      index: item,
      score: this.score[p]!,
      blended: this.blended[p]!,
      multiplier: parts.multiplier[p]!,
      percentile: this.percentile[p]!,
      coldStart: cold,
      contributions: at(parts.contributions),
      normalised: at(parts.normalised),
      raw: at(parts.raw),
      evidence: { content, collaborative },
    };
  }

  /** The n best candidates, explained. */
  top(count: number): ScoredItem[] {
    return Array.from(this.order().subarray(0, Math.max(0, count)), (p) => this.explain(p));
  }
}

function record(value: (j: number) => number): Record<Component, number>;
function record(value: (j: number) => boolean): Record<Component, boolean>;
function record(value: (j: number) => number | boolean): Record<Component, number | boolean> {
  const out = {} as Record<Component, number | boolean>;
  for (let j = 0; j < COMPONENT_COUNT; j++) out[COMPONENTS[j]!] = value(j);
  return out;
}

/** The anchors most similar to `item` (positive similarity only), strongest first, at most 3. */
function topEvidence(rows: Float32Array[], anchors: Int32Array, item: number): Evidence[] {
  const out: Evidence[] = [];
  rows.forEach((row, a) => {
    const s = row[item]!;
    if (s > 0) out.push({ item: anchors[a]!, similarity: s });
  });
  out.sort((x, y) => y.similarity - x.similarity || x.item - y.item);
  return out.slice(0, EVIDENCE_COUNT);
}
