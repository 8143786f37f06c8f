/**
 * The per-model searches of tuning (issue 10 item 2): item-kNN, EASE and iALS, each by coordinate search on
 * its log grid (search.ts) under one shared budget measured in plain fits.
 *
 * Budget: first each searched model is fitted at its start point (its defaults, with the caller's fixed values),
 * which measures what one plain fit of it costs here (fit + measurement on the validation split). The pool is
 * `budget` × the sum of those plain costs; the starts are paid from it, and the rest is shared in order EASE
 * (a third), item-kNN (half of what is left) and iALS (the remainder), so whatever a model leaves unspent goes to
 * the next. A trial's cost is predicted from the plain cost by a fixed cost model (iALS: its sweeps and the
 * per-sweep work at its factor count; item-kNN and EASE: one plain fit), so the search decides from predictions
 * and never waits on the clock mid-search.
 */
import { CancelledError } from '../../core/errors.ts';
import type { EvalResult } from '../../core/eval/index.ts';
import { nnz, type Csr } from '../../core/matrix/csr.ts';
import { EASE_DEFAULTS, fitEase } from '../../core/models/ease.ts';
import { IALS_DEFAULTS, type IalsParams } from '../../core/models/ials-params.ts';
import { fitItemKnn, ITEMKNN_DEFAULTS } from '../../core/models/itemknn.ts';
import type { Scorer } from '../../core/models/scorer.ts';
import type { ValueTransform } from '../../core/matrix/values.ts';
import { fitIalsThreaded } from '../train/ials-threads.ts';
import { TRAIN_EASE_DEFAULTS } from '../train/train-models.ts';
import { EASE_GRID, fullyFixed, GRID_PARAMS, IALS_GRID, IALS_SEARCH_ITERATIONS, ITEMKNN_GRID, type FixedParams, type GridModel } from './grid.ts';
import { coordinateSearch, type Axis, type Point } from './search.ts';
import type { GridTrial, ModelTuning } from './tune.ts';

export interface ModelSearchOptions {
  train: Csr;
  /** NDCG and recall of a fitted model on the validation split. */
  measure: (name: string, m: Scorer) => EvalResult;
  /** Plain fits the search may spend (grid.ts TUNE_BUDGET). */
  budget: number;
  useEase: boolean;
  fixed: FixedParams;
  /** iALS sweeps of the final training. */
  iterations: number;
  seed: number;
  threads?: number;
  signal?: AbortSignal;
  /** Before each fit: the model, the trial's number and the share of the pool spent so far. */
  onTrial: (model: GridModel, trial: number, spentShare: number) => void;
}

export interface ModelSearches {
  tunings: ModelTuning[];
  /** Milliseconds one plain fit of the searched models took here, and the predicted spend of the whole search. */
  plainMs: number;
  spentMs: number;
  notes: string[];
}

interface Searcher {
  model: GridModel;
  axes: Axis[];
  start: Point;
  /** Cost of a point relative to the start's (the start is 1). */
  relCost: (p: Point) => number;
  fit: (p: Point) => Promise<Scorer>;
  /** The point as training parameters (iALS's confidence axis is two of them); default: as it is. */
  shown?: (p: Point) => Point;
}

/**
 * Where iALS's search starts: regularisation 10, not the 0.01 default, since the grid spans 10⁻² to 10³ and the
 * best values measured lie towards its strong end (the demo shop: 100, NDCG@10 0.169 against 0.111 at 0.01), so
 * one or two steps reach them; log confidence with α 1, since heavy-tailed values (one customer with 300,000
 * plays) are what log scaling is for (Hu et al. 2008 §4). The training defaults stay as they were.
 */
export const IALS_SEARCH_START = { regularization: 10, scaling: 'log', alpha: 1 } as const;

export async function searchModels(o: ModelSearchOptions): Promise<ModelSearches> {
  const notes: string[] = [];
  const fitOpts = o.signal ? { signal: o.signal } : {};
  const items = o.train.cols;
  const searchers: Searcher[] = [];

  // item-kNN: "all" is k = the catalogue size; grid values above it are the same as "all".
  const ks = [...new Set(ITEMKNN_GRID.k.map((k) => (k === 'all' ? items : Math.min(k, items))))].sort((a, b) => a - b);
  searchers.push({
    model: 'itemknn',
    axes: axesOf('itemknn', { k: ks, shrink: ITEMKNN_GRID.shrink, values: ITEMKNN_GRID.values }, o.fixed),
    start: { k: Math.min(ITEMKNN_DEFAULTS.k, Math.max(1, items)), shrink: ITEMKNN_DEFAULTS.shrink, values: ITEMKNN_DEFAULTS.values, ...o.fixed.itemknn },
    relCost: () => 1,
    fit: async (p) => fitItemKnn(o.train, { k: p['k'] as number, shrink: p['shrink'] as number, values: p['values'] as ValueTransform }, fitOpts).model,
  });
  if (o.useEase) {
    searchers.push({
      model: 'ease',
      axes: axesOf('ease', { lambda: EASE_GRID.lambda, values: EASE_GRID.values }, o.fixed),
      start: { lambda: EASE_DEFAULTS.lambda, values: EASE_DEFAULTS.values, ...o.fixed.ease },
      relCost: () => 1,
      fit: async (p) => fitEase(o.train, { ...TRAIN_EASE_DEFAULTS, lambda: p['lambda'] as number, values: p['values'] as ValueTransform }, fitOpts).model,
    });
  }
  // iALS: per sweep, CG touches every observed entry k times and every row's k × k Gram products (Hu et al. §4,
  // Takács et al. 2011), so a sweep costs about nnz·k + (customers + items)·k².
  const work = (k: number) => nnz(o.train) * k + (o.train.rows + o.train.cols) * k * k;
  // α and the scaling act together (one confidence curve, Hu et al. §4): a coordinate step on α alone judges
  // the other scaling at an α made for this one, so they form one categorical axis, "scaling α".
  const heldI = (o.fixed.ials ?? {}) as Record<string, unknown>;
  const confidences = IALS_GRID.scaling
    .flatMap((scaling) => IALS_GRID.alpha.map((alpha) => ({ scaling, alpha })))
    .filter((c) => (heldI['scaling'] ?? c.scaling) === c.scaling && (heldI['alpha'] ?? c.alpha) === c.alpha)
    .map((c) => `${c.scaling} ${c.alpha}`);
  // The confidence comes first: the regularisation that suits a confidence depends on it (the data term of eq. 3
  // grows with the confidences), so λ is line-searched for the confidence chosen rather than the reverse. On the
  // real log of issue 10 the reverse order settled at λ 100, log α 10 (validation NDCG@20 0.084) and never saw
  // λ 0.1, log α 1 (0.090).
  const ialsAxes = axesOf('ials', IALS_GRID, o.fixed).filter((a) => a.name !== 'alpha' && a.name !== 'scaling');
  if (heldI['scaling'] === undefined || heldI['alpha'] === undefined) ialsAxes.unshift({ name: 'confidence', values: confidences });
  const ialsStart: Point = {
    confidence: `${(heldI['scaling'] as string | undefined) ?? IALS_SEARCH_START.scaling} ${(heldI['alpha'] as number | undefined) ?? IALS_SEARCH_START.alpha}`,
    regularization: IALS_SEARCH_START.regularization,
    factors: IALS_DEFAULTS.factors,
    ...(heldI['regularization'] !== undefined && { regularization: heldI['regularization'] as number }),
    ...(heldI['factors'] !== undefined && { factors: heldI['factors'] as number }),
  };
  const ialsParams = (p: Point): Point => {
    const [scaling, alpha] = String(p['confidence']).split(' ');
    return { regularization: p['regularization']!, alpha: Number(alpha), scaling: scaling!, factors: p['factors']! };
  };
  const sweeps = Math.min(IALS_SEARCH_ITERATIONS, o.iterations);
  searchers.push({
    model: 'ials',
    axes: ialsAxes,
    start: ialsStart,
    relCost: (p) => work(p['factors'] as number) / work(ialsStart['factors'] as number),
    shown: ialsParams,
    fit: async (p) =>
      (
        await fitIalsThreaded(
          o.train,
          { ...(ialsParams(p) as Partial<IalsParams>), iterations: sweeps, seed: o.seed },
          { ...fitOpts, ...(o.threads !== undefined && { threads: o.threads }) },
        )
      ).model,
  });
  if (sweeps < o.iterations) notes.push(`iALS trials ran ${sweeps} of the ${o.iterations} training sweeps each (a cheaper fit to rank settings)`);

  // 1. The start of every model: its plain cost, and a fitted model even when nothing is searched.
  const trials = new Map<GridModel, GridTrial[]>();
  const startScore = new Map<GridModel, EvalResult>();
  const unit = new Map<GridModel, number>();
  let plainMs = 0;
  for (const s of searchers) {
    if (o.signal?.aborted) throw new CancelledError('tuning cancelled');
    o.onTrial(s.model, 1, 0);
    const t0 = performance.now();
    const m = await s.fit(s.start);
    const r = o.measure(s.model, m);
    const ms = performance.now() - t0;
    startScore.set(s.model, r);
    const shown = s.shown ?? ((p: Point) => p);
    trials.set(s.model, [{ params: shown(s.start), ndcg: r.ndcg, recall: r.cappedRecall, elapsedMs: ms }]);
    // iALS's start ran `sweeps` of the training's sweeps: a plain fit costs iterations / sweeps as much.
    const plain = s.model === 'ials' ? (ms * o.iterations) / sweeps : ms;
    unit.set(s.model, s.model === 'ials' ? ms : plain);
    if (!fullyFixed(s.model, o.fixed)) plainMs += plain;
  }

  // 2. The searches, sharing what is left of the pool.
  const pool = o.budget * plainMs;
  let spent = searchers.reduce((sum, s) => sum + (fullyFixed(s.model, o.fixed) ? 0 : unit.get(s.model)!), 0);
  const tunings: ModelTuning[] = [];
  const order: GridModel[] = ['ease', 'itemknn', 'ials'];
  const shareOf: Record<GridModel, number> = { ease: 1 / 3, itemknn: 1 / 2, ials: 1 };
  for (const model of order) {
    const s = searchers.find((x) => x.model === model);
    if (!s) continue;
    const fixed = { ...(o.fixed[model] as Point | undefined) };
    if (fullyFixed(model, o.fixed)) {
      tunings.push({ model, trials: [], best: (s.shown ?? ((p: Point) => p))(s.start), ndcg: Number.NaN, fixed, searched: false });
      continue;
    }
    const u = unit.get(model)!;
    const budgetMs = Math.max(0, pool - spent) * shareOf[model];
    const startKey = JSON.stringify(s.start);
    const found = await coordinateSearch({
      axes: s.axes,
      start: s.start,
      budget: budgetMs,
      cost: (p) => (JSON.stringify(p) === startKey ? 0 : u * s.relCost(p)),
      ...(o.signal && { signal: o.signal }),
      onTrial: (t) => o.onTrial(model, t.trial, pool > 0 ? Math.min(1, (spent + t.spent) / pool) : 1),
      evaluate: async (p) => {
        if (JSON.stringify(p) === startKey) return startScore.get(model)!.ndcg;
        const t0 = performance.now();
        const m = await s.fit(p);
        const r = o.measure(model, m);
        const list = trials.get(model)!;
        list.push({ params: (s.shown ?? ((x: Point) => ({ ...x })))(p), ndcg: r.ndcg, recall: r.cappedRecall, elapsedMs: performance.now() - t0 });
        return r.ndcg;
      },
    });
    spent += found.spent;
    const list = trials.get(model)!;
    tunings.push({
      model,
      trials: list,
      best: (s.shown ?? ((x: Point) => x))(found.best),
      ndcg: found.score,
      fixed,
      searched: true,
      search: {
        axes: Object.fromEntries(s.axes.map((a) => [a.name, [...a.values]])),
        // Both include the start, which was paid from the pool before the search got its share.
        budgetPlainFits: u > 0 ? (budgetMs + u) / (model === 'ials' ? (u * o.iterations) / sweeps : u) : 0,
        spentPlainFits: u > 0 ? (found.spent + u) / (model === 'ials' ? (u * o.iterations) / sweeps : u) : 0,
        stopped: found.stopped,
      },
    });
  }
  // Grid order of the result: item-kNN, EASE, iALS (as before).
  tunings.sort((a, b) => ['itemknn', 'ease', 'ials'].indexOf(a.model) - ['itemknn', 'ease', 'ials'].indexOf(b.model));
  return { tunings, plainMs, spentMs: spent, notes };
}

/** The axes of a model's grid, leaving out the parameters the caller fixed (they stay at the caller's value). */
function axesOf<M extends GridModel>(model: M, grid: Record<string, readonly (number | string)[]>, fixed: FixedParams): Axis[] {
  const held = (fixed[model] ?? {}) as Record<string, unknown>;
  return (GRID_PARAMS[model] as readonly string[]).filter((p) => held[p] === undefined).map((name) => ({ name, values: grid[name]! }));
}
