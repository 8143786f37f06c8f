/**
 * Everything the fill, the meter and the what-if read about the catalogue, as typed arrays in dense item
 * order (the order of `Dataset.items`). Built once per workspace load; the hot loops then never touch
 * strings or objects. Facet values (category, supplier, tag) become small integer codes.
 */
import { BugError } from '../errors.ts';
import { selfInformation as selfInformationOf } from '../metrics/novelty.ts';
import type { Item } from '../types.ts';
import type { Facet } from './types.ts';

export interface FacetCodes {
  /** Value of each code. */
  values: string[];
  /** Code of each value. */
  code: Map<string, number>;
}

export interface CurationContext {
  /** Number of items. */
  n: number;
  /** Workspace item id of each dense index, and the reverse. */
  itemIds: Int32Array;
  indexOfId: Map<number, number>;
  /** The shop's own id of each dense index: what messages to editors name. */
  externalIds: string[];
  category: Int32Array;
  supplier: Int32Array;
  /** Tags of item i are tagCodes[tagPtr[i] .. tagPtr[i + 1]) (CSR-like). */
  tagPtr: Int32Array;
  tagCodes: Int32Array;
  facets: Record<Facet, FacetCodes>;
  /** NaN where unknown. */
  price: Float64Array;
  /** Unix ms; NaN where unknown. */
  addedAt: Float64Array;
  promoted: Uint8Array;
  available: Uint8Array;
  /** Item vectors, row-major n × dim, each row l2-normalised (all-zero rows stay zero: similarity 0). */
  dim: number;
  vectors: Float32Array;
  /** p_i: share of customers who interacted with item i. */
  popularity: Float64Array;
  /** −log2 p_i (Zhou et al. 2010), precomputed with the floor described in `buildCurationContext`. */
  selfInformation: Float64Array;
  /**
   * −log2 of that floor: the most self-information any item can have here, so mean self-information lies
   * in [0, ceiling] and the meter's novelty (mean / ceiling) in [0, 1].
   */
  selfInformationCeiling: number;
}

export interface ContextOptions {
  /** Row-major n × dim similarity vectors (e.g. iALS item factors or reduced content vectors). */
  vectors: Float32Array;
  dim: number;
  /** Share of customers who interacted with each item, in [0, 1]. */
  popularity: ArrayLike<number>;
  /**
   * Customers behind `popularity`. An item nobody touched has p = 0 and infinite self-information; it is
   * counted as one customer, as the offline novelty counts it (core/metrics/novelty.ts selfInformation: one
   * floor for the meter and the evaluation). Without a count, half the smallest positive share is used.
   */
  customerCount?: number;
}

function codesOf(): FacetCodes {
  return { values: [], code: new Map() };
}

function codeFor(f: FacetCodes, value: string): number {
  let c = f.code.get(value);
  if (c === undefined) {
    c = f.values.length;
    f.values.push(value);
    f.code.set(value, c);
  }
  return c;
}

export function buildCurationContext(items: readonly Item[], options: ContextOptions): CurationContext {
  const n = items.length;
  const { dim } = options;
  if (!Number.isInteger(dim) || dim < 1) throw new BugError(`curation context: dim must be an integer >= 1, got ${dim}`);
  if (options.vectors.length !== n * dim) {
    throw new BugError(`curation context: vectors hold ${options.vectors.length} values, expected ${n} × ${dim}`);
  }
  if (options.popularity.length !== n) {
    throw new BugError(`curation context: popularity has ${options.popularity.length} entries, expected ${n}`);
  }
  const facets: Record<Facet, FacetCodes> = { category: codesOf(), supplier: codesOf(), tag: codesOf() };
  const itemIds = new Int32Array(n);
  const externalIds: string[] = new Array<string>(n);
  const indexOfId = new Map<number, number>();
  const category = new Int32Array(n);
  const supplier = new Int32Array(n);
  const tagPtr = new Int32Array(n + 1);
  const tagList: number[] = [];
  const price = new Float64Array(n);
  const addedAt = new Float64Array(n);
  const promoted = new Uint8Array(n);
  const available = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const it = items[i] as Item;
    itemIds[i] = it.id;
    externalIds[i] = it.externalId;
    indexOfId.set(it.id, i);
    category[i] = codeFor(facets.category, it.category);
    supplier[i] = codeFor(facets.supplier, it.supplier);
    // A tag listed twice on one item counts once (quotas count items, not tag mentions).
    const seen = new Set<number>();
    for (const t of it.tags) {
      const c = codeFor(facets.tag, t);
      if (!seen.has(c)) {
        seen.add(c);
        tagList.push(c);
      }
    }
    tagPtr[i + 1] = tagList.length;
    price[i] = it.price ?? NaN;
    addedAt[i] = it.addedAt ?? NaN;
    promoted[i] = it.promoted ? 1 : 0;
    available[i] = it.available ? 1 : 0;
  }
  const vectors = normaliseRows(options.vectors, n, dim);
  const popularity = new Float64Array(n);
  let smallest = Infinity;
  for (let i = 0; i < n; i++) {
    const p = options.popularity[i] as number;
    if (!(p >= 0 && p <= 1)) throw new BugError(`curation context: popularity[${i}] = ${p} is not a share in [0, 1]`);
    popularity[i] = p;
    if (p > 0 && p < smallest) smallest = p;
  }
  const customers = options.customerCount;
  const floor = customers !== undefined ? 1 / Math.max(1, customers) : Number.isFinite(smallest) ? smallest / 2 : 1;
  const selfInformation = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = popularity[i] as number;
    selfInformation[i] = customers !== undefined && customers >= 1 ? selfInformationOf(p * customers, customers) : -Math.log2(Math.max(p, floor));
  }
  return {
    n,
    itemIds,
    indexOfId,
    externalIds,
    category,
    supplier,
    tagPtr,
    tagCodes: Int32Array.from(tagList),
    facets,
    price,
    addedAt,
    promoted,
    available,
    dim,
    vectors,
    popularity,
    selfInformation,
    selfInformationCeiling: -Math.log2(floor),
  };
}

/** A copy with each row scaled to unit l2 norm, so cosine similarity is a dot product. */
export function normaliseRows(v: Float32Array, n: number, dim: number): Float32Array {
  const out = new Float32Array(n * dim);
  for (let i = 0; i < n; i++) {
    const o = i * dim;
    let s = 0;
    for (let f = 0; f < dim; f++) {
      const x = v[o + f] as number;
      s += x * x;
    }
    if (!Number.isFinite(s)) throw new BugError(`curation context: vector of item ${i} is not finite`);
    if (s === 0) continue;
    const inv = 1 / Math.sqrt(s);
    for (let f = 0; f < dim; f++) out[o + f] = (v[o + f] as number) * inv;
  }
  return out;
}

/** Cosine similarity of items a and b (rows are unit length, so the dot product). */
export function similarity(ctx: CurationContext, a: number, b: number): number {
  const { vectors, dim } = ctx;
  const oa = a * dim;
  const ob = b * dim;
  let s = 0;
  for (let f = 0; f < dim; f++) s += (vectors[oa + f] as number) * (vectors[ob + f] as number);
  return s;
}

/** Whether item i carries facet value code c. */
export function hasFacet(ctx: CurationContext, facet: Facet, i: number, c: number): boolean {
  if (facet === 'category') return ctx.category[i] === c;
  if (facet === 'supplier') return ctx.supplier[i] === c;
  for (let p = ctx.tagPtr[i] as number, end = ctx.tagPtr[i + 1] as number; p < end; p++) {
    if (ctx.tagCodes[p] === c) return true;
  }
  return false;
}
