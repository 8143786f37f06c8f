import { InputError } from '../errors.ts';
import type { Csr } from '../matrix/csr.ts';
import {
  claimGramBlocks,
  claimSolveChunks,
  ialsSchedule,
  prepareIals,
  sumGramBlocks,
  sumPartials,
  type IalsState,
  type IalsWork,
} from './ials-fit.ts';
import { confidence, ialsParams, type IalsParams } from './ials-params.ts';
import { topN } from './topn.ts';
import { addGramRows, dotFF, mirrorGram } from './ials-kernels.ts';
import { solveRows, solveScratchLength } from './ials-solve.ts';
import type { FitOptions, FitReport, Scorer, TopN } from './scorer.ts';

/**
 * iALS, Hu, Koren & Volinsky (2008), "Collaborative Filtering for Implicit Feedback Datasets":
 * x_u = (YᵀC_uY + λI)⁻¹ YᵀC_u p_u and symmetrically for items, solved by conjugate gradient as in
 * Takács, Pilászy & Tikk (2011). A trained model: customer factors X (customers × k) and item factors
 * Y (items × k), row-major float32. Predicted preference p̂_ui = x_uᵀy_i.
 */
export class IalsModel implements Scorer {
  readonly kind = 'ials' as const;
  readonly itemCount: number;
  readonly customerCount: number;
  readonly factors: number;
  readonly params: IalsParams;
  /** customers × k, row-major: for taste groups and meter vectors. */
  readonly customerFactors: Float32Array;
  /** items × k, row-major. */
  readonly itemFactors: Float32Array;
  #itemNorms: Float32Array | null = null;
  #gram: Float64Array | null = null;

  constructor(params: IalsParams, customerFactors: Float32Array, itemFactors: Float32Array) {
    const k = params.factors;
    if (customerFactors.length % k !== 0 || itemFactors.length % k !== 0) {
      throw new InputError(`iALS factor arrays are not multiples of k = ${k}`);
    }
    this.params = params;
    this.factors = k;
    this.customerFactors = customerFactors;
    this.itemFactors = itemFactors;
    this.customerCount = customerFactors.length / k;
    this.itemCount = itemFactors.length / k;
  }

  /**
   * out[i] = x_uᵀy_i. A customer who joined after training (u beyond the trained rows) is folded in
   * from `history`: eq. (4) of Hu et al. solved for x_u with Y held (fold-in: common practice, no
   * source); with no history the scores are 0 (no evidence).
   */
  scoreInto(u: number, history: Csr, out: Float32Array): void {
    const k = this.factors;
    let x: Float32Array;
    let off = 0;
    if (u >= 0 && u < this.customerCount) {
      x = this.customerFactors;
      off = u * k;
    } else x = this.foldIn(u, history);
    const y = this.itemFactors;
    for (let i = 0, n = this.itemCount; i < n; i++) out[i] = dotFF(x, off, y, i * k, k);
  }

  /**
   * out[i] = x_uᵀy_i with x_u always folded in from `history` (eq. (4) of Hu et al. with Y held), never the
   * trained row: for a history that has grown since training (services/evaluate.ts scores its test window
   * over train + validation), so iALS reads the same history as item-kNN and EASE do.
   */
  scoreFromHistoryInto(u: number, history: Csr, out: Float32Array): void {
    const k = this.factors;
    const x = this.foldIn(u, history);
    const y = this.itemFactors;
    for (let i = 0, n = this.itemCount; i < n; i++) out[i] = dotFF(x, 0, y, i * k, k);
  }

  /** This model as a Scorer whose `scoreInto` is `scoreFromHistoryInto` (every customer folded in). */
  foldingIn(): Scorer {
    return {
      kind: this.kind,
      itemCount: this.itemCount,
      scoreInto: (u, history, out) => this.scoreFromHistoryInto(u, history, out),
      similarityInto: (i, out) => this.similarityInto(i, out),
      similarItems: (i, n) => this.similarItems(i, n),
      serialize: () => this.serialize(),
    };
  }

  /** A customer vector solved from a history row (the trained vector when the customer was trained). */
  foldIn(u: number, history: Csr): Float32Array {
    const k = this.factors;
    const x = new Float32Array(k);
    if (u < 0 || u >= history.rows) return x;
    const p0 = history.indptr[u]!;
    const p1 = history.indptr[u + 1]!;
    const idx: number[] = [];
    const conf: number[] = [];
    for (let q = p0; q < p1; q++) {
      const v = history.data[q]!;
      const i = history.indices[q]!;
      if (v > 0 && Number.isFinite(v) && i < this.itemCount) {
        idx.push(i);
        conf.push(confidence(this.params, v));
      }
    }
    if (idx.length === 0) return x;
    solveRows(
      {
        k,
        // A model imported from Spark weights λ by the row's positive entries (ials-params.ts).
        lambda: this.params.regularization * (this.params.regularizationScaling === 'signals' ? idx.length : 1),
        cgSteps: 2 * k, // near-exact: CG ends in at most k steps in exact arithmetic
        rows: { rows: 1, indptr: Int32Array.of(0, idx.length), indices: Int32Array.from(idx), conf: Float32Array.from(conf) },
        target: x,
        fixed: this.itemFactors,
        gram: this.itemGram(),
      },
      0,
      1,
      new Float64Array(solveScratchLength(k)),
      false,
    );
    return x;
  }

  /** Cosine of item factor vectors (0 where a vector is zero); i itself gets 0. */
  similarityInto(i: number, out: Float32Array): void {
    checkItem(i, this.itemCount);
    const k = this.factors;
    const y = this.itemFactors;
    const norms = this.itemNorms();
    const ni = norms[i]!;
    for (let j = 0, n = this.itemCount; j < n; j++) {
      const d = ni * norms[j]!;
      out[j] = d > 0 ? dotFF(y, i * k, y, j * k, k) / d : 0;
    }
    out[i] = 0;
  }

  similarItems(i: number, n: number): TopN {
    const sims = new Float32Array(this.itemCount);
    this.similarityInto(i, sims);
    return topN(sims, n, i);
  }

  /**
   * Layout (little-endian): "IALS", u32 version 1, u32 customers, u32 items, u32 k, u32 length of the
   * params JSON, the JSON padded with spaces to 4 bytes, then X and Y as float32.
   */
  serialize(): Uint8Array {
    const own = inPlace.get(this);
    if (own) return own; // allocateIals: the factors were filled in place
    const { out, head } = serializedHeader(this.params, this.customerCount, this.itemCount);
    writeFloats(out, head, this.customerFactors);
    writeFloats(out, head + this.customerFactors.byteLength, this.itemFactors);
    return out;
  }

  private itemNorms(): Float32Array {
    if (!this.#itemNorms) {
      const k = this.factors;
      const norms = new Float32Array(this.itemCount);
      for (let j = 0; j < this.itemCount; j++) norms[j] = Math.sqrt(dotFF(this.itemFactors, j * k, this.itemFactors, j * k, k));
      this.#itemNorms = norms;
    }
    return this.#itemNorms;
  }

  private itemGram(): Float64Array {
    if (!this.#gram) {
      const g = new Float64Array(this.factors * this.factors);
      addGramRows(this.itemFactors, this.factors, 0, this.itemCount, g);
      mirrorGram(g, this.factors);
      this.#gram = g;
    }
    return this.#gram;
  }
}

const MAGIC = new TextEncoder().encode('IALS');

/** The serialized form's header written into a buffer of the full length; the factors go at `head`. */
function serializedHeader(params: IalsParams, customers: number, items: number): { out: Uint8Array; head: number } {
  const k = params.factors;
  const json = new TextEncoder().encode(JSON.stringify(params));
  const jsonLen = Math.ceil(json.length / 4) * 4;
  const head = 24 + jsonLen;
  const out = new Uint8Array(head + 4 * k * (customers + items));
  const view = new DataView(out.buffer);
  out.set(MAGIC, 0);
  view.setUint32(4, 1, true);
  view.setUint32(8, customers, true);
  view.setUint32(12, items, true);
  view.setUint32(16, k, true);
  view.setUint32(20, jsonLen, true);
  out.fill(0x20, 24, head);
  out.set(json, 24);
  return { out, head };
}

const LITTLE_ENDIAN = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;

/**
 * A zero model whose factor arrays are views into its own serialized bytes, for filling in place: a large
 * model built outside training (an imported one: a million items × 64 factors is 256 MB) is then stored
 * without a second copy. The serialized floats are little-endian, so on a big-endian machine the arrays are
 * separate and `serialize()` copies as usual.
 */
export function allocateIals(params: IalsParams, customers: number, items: number): IalsModel {
  const k = params.factors;
  if (!LITTLE_ENDIAN) return new IalsModel(params, new Float32Array(customers * k), new Float32Array(items * k));
  const { out, head } = serializedHeader(params, customers, items);
  const x = new Float32Array(out.buffer, out.byteOffset + head, customers * k);
  const y = new Float32Array(out.buffer, out.byteOffset + head + 4 * customers * k, items * k);
  const model = new IalsModel(params, x, y);
  inPlace.set(model, out);
  return model;
}

/** The bytes an `allocateIals` model lives in (serialize returns them as they are). */
const inPlace = new WeakMap<IalsModel, Uint8Array>();

function writeFloats(out: Uint8Array, at: number, a: Float32Array): void {
  const le = new DataView(out.buffer, out.byteOffset + at, a.byteLength);
  for (let q = 0; q < a.length; q++) le.setFloat32(4 * q, a[q]!, true);
}

function readFloats(bytes: Uint8Array, at: number, n: number): Float32Array {
  const view = new DataView(bytes.buffer, bytes.byteOffset + at, 4 * n);
  const out = new Float32Array(n);
  for (let q = 0; q < n; q++) out[q] = view.getFloat32(4 * q, true);
  return out;
}

function checkItem(i: number, n: number): void {
  if (!Number.isInteger(i) || i < 0 || i >= n) throw new InputError(`item index ${i} is outside 0..${n - 1}`);
}

/** Restores a model written by `serialize`; refuses bytes that are not one. */
export function loadIals(bytes: Uint8Array): IalsModel {
  const bad = (why: string) => new InputError(`not an iALS model: ${why}`);
  if (bytes.length < 24) throw bad('too short');
  for (let q = 0; q < 4; q++) if (bytes[q] !== MAGIC[q]) throw bad('wrong header');
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = view.getUint32(4, true);
  if (version !== 1) throw bad(`format version ${version}, this program reads 1`);
  const customers = view.getUint32(8, true);
  const items = view.getUint32(12, true);
  const k = view.getUint32(16, true);
  const jsonLen = view.getUint32(20, true);
  const head = 24 + jsonLen;
  if (bytes.length !== head + 4 * k * (customers + items)) throw bad('length does not match its header');
  let params: IalsParams;
  try {
    params = ialsParams(JSON.parse(new TextDecoder().decode(bytes.subarray(24, head))) as Partial<IalsParams>);
  } catch (e) {
    throw bad(`parameters unreadable (${(e as Error).message})`);
  }
  if (params.factors !== k) throw bad('factor count differs from its parameters');
  return new IalsModel(params, readFloats(bytes, head, customers * k), readFloats(bytes, head + 4 * customers * k, items * k));
}

/**
 * Performs one unit of the schedule on this thread alone: it claims every Gram block or row chunk
 * in order, the same units the threaded runner shares out, so both add the same numbers.
 */
export function runWorkHere(s: IalsState, work: IalsWork, scratch: Float64Array): number {
  Atomics.store(s.counter, 0, 0);
  if (work.op === 'gram') {
    claimGramBlocks(s, work.side);
    sumGramBlocks(s, work.side);
    return 0;
  }
  claimSolveChunks(s, work.side, work.observed, scratch);
  return work.observed ? sumPartials(s) : 0;
}

/** The report every iALS fit returns. */
export function ialsReport(elapsedMs: number, losses: number[], notes: string[] = []): FitReport {
  return { kind: 'ials', elapsedMs, iterations: losses.length, losses, notes };
}

/** Trains on this thread. `m` is the customers × items interaction matrix (values r ≥ 0). */
export function fitIals(
  m: Csr,
  given: Partial<IalsParams> = {},
  opts: FitOptions = {},
): { model: IalsModel; report: FitReport } {
  const started = performance.now();
  const params = ialsParams(given);
  const state = prepareIals(m, params);
  const scratch = new Float64Array(solveScratchLength(params.factors));
  const schedule = ialsSchedule(state, opts);
  let step = schedule.next();
  while (!step.done) step = schedule.next(runWorkHere(state, step.value, scratch));
  return {
    model: new IalsModel(params, state.x, state.y),
    report: ialsReport(performance.now() - started, step.value),
  };
}
