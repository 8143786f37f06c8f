/**
 * Everything a shelf's fill, meter and backtest read about the workspace, loaded once per workspace state:
 * the catalogue, the signals in columns, the curation context (typed arrays), popularity, trend and the
 * hybrid scorer over the workspace's trained models. Cached per connection and model source, and rebuilt
 * when the catalogue, the signals or the trained models change.
 */
import { buildCurationContext, type CurationContext } from '../../core/curation/context.ts';
import { signalsByCustomer } from '../../core/matrix/by-customer.ts';
import { trendRatios } from '../../core/models/popularity.ts';
import type { Csr } from '../../core/matrix/csr.ts';
import { HybridScorer, type BlendScorer, type HybridModels } from '../../core/scoring/index.ts';
import type { Dataset } from '../../core/types.ts';
import { loadDataset } from '../../store/dataset.ts';
import { readWorldStamp } from '../../store/world-stamp.ts';
import type { Db } from '../../store/workspace.ts';

export interface CurationWorld {
  ds: Dataset;
  ctx: CurationContext;
  hybrid: HybridScorer;
  /** Distinct customers per dense item. */
  customersPerItem: Int32Array;
  /** Taste group of each dense customer (k-means over iALS customer factors), when discovered. */
  groups: Int32Array | undefined;
  /** The editor's name of each taste group now (carried across trainings by overlap), null when unnamed. */
  groupNames: readonly (string | null)[] | undefined;
  /**
   * The validated blend (services/tune/blend.ts) with the interaction matrix it reads customers' histories
   * from: what "relevance" means for an audience. null without trained models. Loaded on first use (it
   * builds the interaction matrix), so a world that never reads an audience never pays for it.
   */
  readonly blend: BlendRef | null;
  /** Signals by customer, CSR-like: the signals of customer u are bySignal[ptr[u] .. ptr[u + 1]). */
  byCustomer: { ptr: Int32Array; signal: Int32Array };
  /** Readings that depend only on the data and an argument (e.g. an audience's mix), keyed by it. */
  memo: Map<string, unknown>;
}


/**
 * Trained models for the hybrid, when the workspace has them. Until a models store is wired in, every
 * model is absent and the hybrid blends what needs no training (popularity, freshness): the components
 * it cannot use are dropped and the remaining weights renormalised (scoring/components.ts).
 */
export interface BlendRef {
  scorer: BlendScorer;
  history: Csr;
}

export type ModelSource = (
  db: Db,
  ds: Dataset,
) => { models: HybridModels; vectors?: { data: Float32Array; dim: number }; groups?: Int32Array; groupNames?: (string | null)[]; blend?: () => BlendRef | null };

export const noModels: ModelSource = () => ({ models: { content: null, collaborative: null, affinity: null } });

/**
 * Item vectors for similarity when no model supplies them: one-hot category, supplier and tags, so
 * intra-list distance and MMR see two items of the same category and supplier as alike (the
 * "one-hot categorical attributes" half of DESIGN.md's content method).
 */
export function attributeVectors(ds: Dataset): { data: Float32Array; dim: number } {
  const code = new Map<string, number>();
  const keyed = ds.items.map((it) => [`c:${it.category}`, `s:${it.supplier}`, ...it.tags.map((t) => `t:${t}`)]);
  for (const keys of keyed) for (const k of keys) if (!code.has(k)) code.set(k, code.size);
  const dim = Math.max(1, code.size);
  const data = new Float32Array(ds.items.length * dim);
  keyed.forEach((keys, i) => {
    for (const k of keys) data[i * dim + code.get(k)!] = 1;
  });
  return { data, dim };
}

/** Distinct customers per item: walk each customer's signals, counting an item once per customer. */
function customersPerItemOf(ds: Dataset, byCustomer: { ptr: Int32Array; signal: Int32Array }): Int32Array {
  const out = new Int32Array(ds.items.length);
  const last = new Int32Array(ds.items.length).fill(-1);
  const { ptr, signal } = byCustomer;
  for (let u = 0; u + 1 < ptr.length; u++) {
    for (let p = ptr[u]!, end = ptr[u + 1]!; p < end; p++) {
      const i = ds.signals.item[signal[p]!]!;
      if (last[i] === u) continue;
      last[i] = u;
      out[i]!++;
    }
  }
  return out;
}

/** One world per connection and model source: the api's source (with taste groups) and propose's differ. */
const cache = new WeakMap<Db, Map<ModelSource, { stamp: string; world: CurationWorld }>>();

export function loadWorld(db: Db, source: ModelSource = noModels): CurationWorld {
  const st = readWorldStamp(db);
  let bySource = cache.get(db);
  if (!bySource) cache.set(db, (bySource = new Map()));
  const hit = bySource.get(source);
  if (hit && hit.stamp === st) return hit.world;
  const ds = loadDataset(db);
  const byCustomer = signalsByCustomer(ds.signals, ds.customerIds.length);
  const customersPerItem = customersPerItemOf(ds, byCustomer);
  const nC = ds.customerIds.length;
  const popularity = Float64Array.from(customersPerItem, (c) => (nC === 0 ? 0 : c / nC));
  const m = source(db, ds);
  const vectors = m.vectors ?? attributeVectors(ds);
  const ctx = buildCurationContext(ds.items, { vectors: vectors.data, dim: vectors.dim, popularity, customerCount: nC });
  const addedAt = Float64Array.from(ds.items, (it) => it.addedAt ?? NaN);
  // Trend at the end of the history (trendRatios' default: 14-day windows ending just after the latest
  // signal), the reading for any edition dated after it; `trendFor` gives back-dated editions their own.
  // Signals without any time (a shop's export of counts) carry no trend: the component is left out, not read
  // as "1 for every item", so its weight goes to the components that can tell items apart.
  const timed = ds.signals.at.some((t) => t === t);
  const trend = timed ? Float32Array.from(trendRatios(ds)) : null;
  // Min–max within the pool, not percentiles: the validated relevance of a pool's best few hundred items
  // differs by tenths, which percentiles flatten to 0.99-and-up, and the fill's MMR then trades that
  // flattened relevance for variety alone (a 'bought indoor plants' shelf opened with a fire bowl, a watering
  // timer and a butterfly bush; with min–max it opens with palms, pots and saucers at 1% of relevance).
  const hybrid = new HybridScorer(m.models, { customersPerItem, trend, addedAt }, { normalisation: 'minmax' });
  let blend: BlendRef | null | undefined;
  const world: CurationWorld = {
    ds,
    ctx,
    hybrid,
    customersPerItem,
    groups: m.groups,
    groupNames: m.groupNames,
    get blend() {
      if (blend === undefined) blend = m.blend ? m.blend() : null;
      return blend;
    },
    byCustomer,
    memo: new Map(),
  };
  bySource.set(source, { stamp: st, world });
  return world;
}

/**
 * The trend ratios an edition is scored with, one rule for shelves and `propose`: measured at the edition's
 * date, or at the end of the history when the edition is dated after the last signal. An edition is usually
 * planned ahead of the data, and measuring at its date would leave the recent window partly empty; a
 * back-dated edition must not see signals from after its date. Returns undefined for "the world's own".
 */
export function trendFor(world: CurationWorld, editionDate: number): Float32Array | null | undefined {
  const end = trendEnd(world, editionDate);
  if (end === undefined) return undefined;
  const at = `trend@${editionDate}`;
  let trend = world.memo.get(at) as Float32Array | undefined;
  if (!trend) world.memo.set(at, (trend = Float32Array.from(trendRatios(world.ds, { now: editionDate }))));
  return trend;
}

/**
 * Where trendFor's recent window ends for an edition: its date when that is before the end of the history,
 * else undefined ("the world's own": just after the latest signal, trendRatios' default).
 */
export function trendEnd(world: CurationWorld, editionDate: number): number | undefined {
  const s = world.ds.signals;
  if (s.length === 0) return undefined;
  let last = -Infinity;
  const key = 'trend:last';
  const known = world.memo.get(key) as number | undefined;
  if (known !== undefined) last = known;
  else {
    for (let k = 0; k < s.length; k++) if (s.at[k]! > last) last = s.at[k]!;
    world.memo.set(key, last);
  }
  return editionDate < last + 1 ? editionDate : undefined;
}
