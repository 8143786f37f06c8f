import { SectionReader, formatVersion, packSections } from '../matrix/bytes.ts';
import { nnz, type Csr } from '../matrix/csr.ts';
import { easeWeights, type EaseSolveHooks } from './ease-weights.ts';
import { EASE_DENSE_MAX_BYTES, EASE_MAGIC, EASE_TOP_K, EaseTopKModel, keptSimilarItems, sparsifyEase } from './ease-topk.ts';
import { CancelledError, InputError } from '../errors.ts';
import { checkTransform, decayedValue, transformCode, transformFromCode, transformMatrix, type ValueTransform } from '../matrix/values.ts';
import { describeRecency, NO_RECENCY, recencyFromSection, recencyOf, recencySection, type Recency } from './recency.ts';
import type { FitOptions, FitReport, Scorer, TopN } from './scorer.ts';
import { topN } from './topn.ts';

/**
 * EASE, Steck (2019), "Embarrassingly Shallow Autoencoders for Sparse Data", eq. (8): the item–item
 * weights minimising ‖X − XB‖² + λ‖B‖² subject to diag(B) = 0 are
 *   P = (XᵀX + λI)⁻¹,   B = I − P · diag(1 / diag(P)),   i.e. B_ij = −P_ij / P_jj (i ≠ j), B_jj = 0.
 * Scores are x_u · B, with X's values through the model's transform (matrix/values.ts; presence by default:
 * Steck fits a binary X, and λ sized for counts of 1 then suits any shop). The inverse is dense (n² float32,
 * ease-weights.ts), so the catalogue size is bounded by `maxItems`.
 */
export interface EaseParams {
  /** λ in the paper. Default 500 (from memory: the paper's tuned values lie in the hundreds). */
  lambda?: number;
  /** Largest item count fitted. Default 20,000 (DESIGN.md; 1.6 GB for the float32 inverse at that size). */
  maxItems?: number;
  /** Above maxItems: false (default) refuses with an InputError; true keeps the maxItems most active items. */
  restrict?: boolean;
  /** How a matrix value enters, in the fit and in scoring. Default presence. */
  values?: ValueTransform;
  /** Half-life in days of the entries of X the Gram matrix is built from (matrix/values.ts "Recency"); null/absent = off. */
  fitHalfLifeDays?: number | null;
  /** Half-life in days of the customer's row x_u in scoring x_u · B; null/absent = off. */
  profileHalfLifeDays?: number | null;
}

export const EASE_DEFAULTS = { lambda: 500, maxItems: 20_000, restrict: false, values: 'presence' } as const satisfies EaseParams;

export class EaseModel implements Scorer {
  readonly kind = 'ease' as const;
  /**
   * @param itemCount items of the catalogue (columns of the interaction matrix)
   * @param kept global item index of each fitted item (ascending); items not kept score 0
   * @param b fitted weights, kept × kept, row-major: b[r * kept + c] = B_rc
   */
  constructor(
    readonly itemCount: number,
    readonly kept: Int32Array,
    readonly b: Float32Array,
    readonly values: ValueTransform = EASE_DEFAULTS.values,
    readonly recency: Recency = NO_RECENCY,
  ) {
    const m = kept.length;
    if (b.length !== m * m) throw new InputError(`EASE weights have ${b.length} entries, expected ${m * m}`);
    this.#local = new Int32Array(itemCount).fill(-1);
    for (let r = 0; r < m; r++) this.#local[kept[r]!] = r;
  }
  readonly #local: Int32Array;

  scoreInto(u: number, history: Csr, out: Float32Array): void {
    out.fill(0);
    const m = this.kept.length;
    const b = this.b;
    const kept = this.kept;
    const whole = m === this.itemCount; // kept is then the identity: skip the indirection
    for (let p = history.indptr[u]!, end = history.indptr[u + 1]!; p < end; p++) {
      const r = this.#local[history.indices[p]!]!;
      if (r < 0) continue;
      const x = decayedValue(history, p, this.values, this.recency.profileHalfLifeDays);
      const row = r * m;
      if (whole) for (let c = 0; c < m; c++) out[c]! += x * b[row + c]!;
      else for (let c = 0; c < m; c++) out[kept[c]!]! += x * b[row + c]!;
    }
  }

  /** Row i of B: how much having item i adds to every other item's score. */
  similarityInto(i: number, out: Float32Array): void {
    out.fill(0);
    const r = this.#local[i]!;
    if (r < 0) return;
    const m = this.kept.length;
    for (let c = 0; c < m; c++) out[this.kept[c]!] = this.b[r * m + c]!;
    out[i] = 0;
  }

  similarItems(i: number, n: number): TopN {
    return keptSimilarItems(this, i, n);
  }

  /**
   * Dense B (format 2) up to EASE_DENSE_MAX_BYTES; above, the top EASE_TOP_K weights of each row (format 3,
   * ease-topk.ts): a 20,000-item dense B is 1.6 GB, beyond a SQLite blob.
   */
  serialize(): Uint8Array {
    if (this.b.byteLength > EASE_DENSE_MAX_BYTES) {
      return sparsifyEase(this.itemCount, this.kept, this.b, EASE_TOP_K, this.values, this.recency).serialize();
    }
    return packSections(EASE_MAGIC, 4, [Int32Array.of(this.itemCount), this.kept, this.b, Int32Array.of(transformCode(this.values)), recencySection(this.recency)]);
  }

  /** The same weights scoring with another profile half-life (no refit: the profile side only reads the history). */
  withProfileHalfLife(profileHalfLifeDays: number | null): EaseModel {
    return new EaseModel(this.itemCount, this.kept, this.b, this.values, { ...this.recency, profileHalfLifeDays });
  }
}

/**
 * Restores every stored form: format 1 (dense, before value transforms: raw values, i.e. linear), format 2
 * (dense, with its transform), format 3 (top-k weights per item, with its transform; ease-topk.ts), and formats
 * 4 (dense) and 5 (top-k) with the recency half-lives; before 4 and 5 there was no recency (both sides off).
 */
export function loadEase(bytes: Uint8Array): EaseModel | EaseTopKModel {
  const version = formatVersion(bytes);
  if (version === 3 || version === 5) {
    const r = new SectionReader(bytes, EASE_MAGIC, version);
    const head = r.i32();
    const kept = r.i32();
    const indptr = r.i32();
    const cols = r.i32();
    const w = r.f32();
    const t = transformFromCode(r.i32()[0]!);
    return new EaseTopKModel(head[0]!, kept, indptr, cols, w, t, version === 5 ? recencyFromSection(r.f64()) : NO_RECENCY);
  }
  const r = new SectionReader(bytes, EASE_MAGIC, version === 1 ? 1 : version === 2 ? 2 : 4);
  const head = r.i32();
  const kept = r.i32();
  const b = r.f32();
  const values = version === 1 ? 'linear' : transformFromCode(r.i32()[0]!);
  return new EaseModel(head[0]!, kept, b, values, version === 4 ? recencyFromSection(r.f64()) : NO_RECENCY);
}

/**
 * Fits EASE on an interaction matrix (customers × items). `solver.invert` runs the inverse elsewhere
 * than on this thread alone (services/train/ease-inverse-threads.ts: several threads, same result).
 */
export function fitEase(
  raw: Csr,
  params: EaseParams = {},
  o: FitOptions = {},
  solver: Pick<EaseSolveHooks, 'invert'> = {},
): { model: EaseModel; report: FitReport } {
  const start = performance.now();
  const values = checkTransform(params.values ?? EASE_DEFAULTS.values);
  const recency = recencyOf(params, 'EASE');
  const x = transformMatrix(raw, values, recency.fitHalfLifeDays);
  const lambda = params.lambda ?? EASE_DEFAULTS.lambda;
  const maxItems = params.maxItems ?? EASE_DEFAULTS.maxItems;
  if (!(lambda > 0)) throw new InputError(`EASE lambda must be > 0, got ${lambda}`);
  if (!(Number.isInteger(maxItems) && maxItems > 0)) throw new InputError(`EASE maxItems must be a positive integer, got ${maxItems}`);
  const notes: string[] = [];
  let kept: Int32Array;
  if (x.cols > maxItems) {
    if (!params.restrict) {
      throw new InputError(
        `EASE needs a dense ${x.cols} × ${x.cols} inverse, above the limit of ${maxItems} items; ` +
          'raise maxItems if memory allows, or set restrict to fit the most active items only',
      );
    }
    kept = mostActive(x, maxItems);
    notes.push(`EASE restricted to the ${maxItems} most active of ${x.cols} items; the others score 0`);
  } else {
    kept = new Int32Array(x.cols);
    for (let c = 0; c < x.cols; c++) kept[c] = c;
  }
  const m = kept.length;
  if (o.signal?.aborted) throw new CancelledError();
  // Progress: one "iteration" per phase of the inverse (Cholesky, L⁻¹, product), then the weights.
  const b = easeWeights(x, kept, lambda, {
    ...(o.signal && { signal: o.signal }),
    ...(solver.invert && { invert: solver.invert }),
    onPhase: (phase, phases) => o.onIteration?.({ iteration: phase, iterations: phases + 1, elapsedMs: performance.now() - start }),
  });
  const elapsedMs = performance.now() - start;
  o.onIteration?.({ iteration: 4, iterations: 4, elapsedMs });
  notes.push(`EASE on ${m} items, ${nnz(x)} interactions, lambda ${lambda}, values ${values}, ${describeRecency(recency)}`);
  if (!raw.ageDays && (recency.fitHalfLifeDays !== null || recency.profileHalfLifeDays !== null)) {
    notes.push('EASE: no signal has a time, so the recency half-lives change nothing');
  }
  if (b.byteLength > EASE_DENSE_MAX_BYTES) {
    notes.push(`EASE stored with the ${EASE_TOP_K} largest weights per item (dense weights would be ${(b.byteLength / 2 ** 30).toFixed(1)} GiB)`);
  }
  return { model: new EaseModel(x.cols, kept, b, values, recency), report: { kind: 'ease', elapsedMs, notes } };
}

/** The n items with the most interactions (ties: lower index), returned in ascending index order. */
function mostActive(x: Csr, n: number): Int32Array {
  const count = new Float32Array(x.cols);
  for (let p = 0, total = nnz(x); p < total; p++) count[x.indices[p]!]!++;
  const best = topN(count, n).items;
  return best.sort();
}
