/**
 * A shelf's pool and its scores, remembered per world. An editorial action re-fills the edition, but most
 * shelves' inputs recur: an undo, a redo or a move brings back a pool and boosts seen a moment ago, and a
 * later shelf is re-filled with the same brief and the same items taken by the shelves before it. The
 * pool is a function of the brief, the editorial state and the edition date; its scores add the boosts
 * (the models, trend and audience affinity are the world's own and fixed for its life). Both are keyed
 * by exactly those inputs, so a hit returns what a fresh computation would.
 */
import { buildCandidatePool, type CandidatePool, type EditorialState } from '../../core/curation/candidates.ts';
import type { Brief, Candidate } from '../../core/curation/types.ts';
import type { PoolScores } from '../../core/scoring/index.ts';
import type { CurationWorld } from './world.ts';

/** A pool item with its percentile and its rank by score (1 = best, scoring/rank.ts). */
export interface RankedCandidate {
  index: number;
  percentile: number;
  rank: number;
}

/** A scored pool with what the fill, the slots and the what-if read from it, built once. */
export interface ScoredPool {
  pool: CandidatePool;
  scores: PoolScores;
  /** Candidates best first by boosted score (the fill's input). */
  candidates: Candidate[];
  /** Pool items best first with their percentiles and ranks (the what-if's list), made on first call. */
  ranked: () => readonly RankedCandidate[];
  /** Pool position of each dense item, -1 outside the pool. */
  posOf: Int32Array;
  /** Blended score (before boosts) of each dense item, NaN outside the pool: the meter's relevance. */
  relevance: Float64Array;
}

/** Entries kept per world. A scored pool of the demo shop is about half a megabyte. */
const POOLS_KEPT = 64;
const SCORED_KEPT = 24;

function sortedList(s: Iterable<number>): string {
  return Int32Array.from(s)
    .sort()
    .join(',');
}

/** Every input of buildCandidatePool, as one string. */
export function poolKey(brief: Brief, state: EditorialState, editionDate: number): string {
  const rules = state.banRules.map((r) => `${r.facet}=${r.value}`).sort();
  return [
    JSON.stringify(brief),
    editionDate,
    sortedList(state.bans),
    JSON.stringify(rules),
    sortedList(state.resting),
    sortedList(state.usedInEdition),
    sortedList(state.pins.values()),
  ].join('|');
}

function lru<V>(world: CurationWorld, name: string): Map<string, V> {
  let m = world.memo.get(name) as Map<string, V> | undefined;
  if (!m) world.memo.set(name, (m = new Map()));
  return m;
}

function remember<V>(m: Map<string, V>, key: string, value: V, cap: number): V {
  m.set(key, value);
  if (m.size > cap) m.delete(m.keys().next().value!);
  return value;
}

function recall<V>(m: Map<string, V>, key: string): V | undefined {
  const v = m.get(key);
  if (v !== undefined) {
    m.delete(key); // most recently used goes last
    m.set(key, v);
  }
  return v;
}

/**
 * The pool of `brief` under `state`, scored with `multipliers` (dense item → factor) by `score`, from the
 * world's cache when these inputs were seen before. `score` must depend only on the pool, the brief, the
 * edition date and the multipliers.
 */
export function scoredPool(
  world: CurationWorld,
  brief: Brief,
  state: EditorialState,
  editionDate: number,
  multipliers: ReadonlyMap<number, number>,
  score: (pool: CandidatePool) => PoolScores,
): ScoredPool {
  const pk = poolKey(brief, state, editionDate);
  const sk = `${pk}|${[...multipliers].sort((a, b) => a[0] - b[0]).join(';')}`;
  const scored = lru<ScoredPool>(world, 'scoredPools');
  const hit = recall(scored, sk);
  if (hit) return hit;
  const pools = lru<CandidatePool>(world, 'pools');
  const pool = recall(pools, pk) ?? remember(pools, pk, buildCandidatePool(world.ctx, brief, state, editionDate), POOLS_KEPT);
  const scores = score(pool);
  const order = scores.order();
  const n = world.ctx.n;
  const posOf = new Int32Array(n).fill(-1);
  const relevance = new Float64Array(n).fill(NaN);
  for (let p = 0; p < scores.n; p++) {
    const i = scores.pool[p]!;
    posOf[i] = p;
    relevance[i] = scores.blended[p]!;
  }
  const candidates = Array.from(order, (p): Candidate => ({ index: scores.pool[p]!, relevance: scores.score[p]! }));
  let list: RankedCandidate[] | undefined;
  const ranked = () => {
    if (list) return list;
    const ranks = scores.ranks();
    return (list = Array.from(order, (p) => ({ index: scores.pool[p]!, percentile: scores.percentile[p]!, rank: ranks[p]! })));
  };
  return remember(scored, sk, { pool, scores, candidates, ranked, posOf, relevance }, SCORED_KEPT);
}
