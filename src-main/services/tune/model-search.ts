/**
 * The per-model searches of tuning (issue 10 item 2): item-kNN, EASE and iALS, each by coordinate search on
 * its log grid (search.ts) under one shared budget measured in plain fits.
 *
 * Budget: first each searched model is fitted at its start point (its defaults, with the caller's fixed values).
 * What one plain fit of each costs (fit + measurement on the validation split; iALS with the training's full
 * sweeps) is predicted from the sizes of the data by trial-cost.ts, never measured: the clock of a loaded
 * machine would otherwise change which trials run, so the same data would not give the same search. The pool is
 * `budget` × the sum of those plain costs; the starts are paid from it, and the rest is shared in order EASE
 * (a third), item-kNN (half of what is left) and iALS (the remainder), so whatever a model leaves unspent goes to
 * the next. Every trial's cost is predicted the same way (iALS: its sweeps at its factor count; item-kNN: its
 * neighbour count). The clock (`now`) only times the trials for the record.
 */
import { CancelledError } from '../../core/errors.ts';
import type { EvalResult } from '../../core/eval/index.ts';
import type { Csr } from '../../core/matrix/csr.ts';
import { EASE_DEFAULTS, EaseModel, fitEase } from '../../core/models/ease.ts';
import { IALS_DEFAULTS, type IalsParams } from '../../core/models/ials-params.ts';
import { fitItemKnn, ITEMKNN_DEFAULTS, ItemKnnModel, type KnnNormalize } from '../../core/models/itemknn.ts';
import type { Scorer } from '../../core/models/scorer.ts';
import type { ValueTransform } from '../../core/matrix/values.ts';
import { fitIalsThreaded } from '../train/ials-threads.ts';
import { TRAIN_EASE_DEFAULTS } from '../train/train-models.ts';
import {
  EASE_GRID,
  fullyFixed,
  GRID_PARAMS,
  HALF_LIFE_GRID,
  halfLifeParam,
  IALS_GRID,
  IALS_SEARCH_ITERATIONS,
  ialsScreenShare,
  ITEMKNN_GRID,
  RECENCY_PARAMS,
  TUNE_BUDGET,
  type FixedParams,
  type GridModel,
} from './grid.ts';
import { searchHalfLife, type HalfLifeSearcher, type HalfLifeTuning } from './half-life-search.ts';
import { PROMOTE_ETA, promoteTop } from './promote.ts';
import { coordinateSearch, type Axis, type AxisValue, type Point } from './search.ts';
import { costSizes, easeCost, easeScoreCost, ialsCost, itemKnnCost, itemKnnScoreCost } from './trial-cost.ts';
import type { GridTrial, ModelTuning, TunerNote } from './tune.ts';

export interface ModelSearchOptions {
  train: Csr;
  /** NDCG and recall of a fitted model on the validation split. */
  /** `perCustomer`, when given (length `customers`), receives each validation customer's NDCG (paired comparisons). */
  measure: (name: string, m: Scorer, perCustomer?: Float64Array) => EvalResult;
  /** Plain fits the search may spend (grid.ts TUNE_BUDGET). */
  budget: number;
  useEase: boolean;
  fixed: FixedParams;
  /** ε of iALS's log confidence in every trial: the training's (core/matrix/signal-unit.ts), so trials fit what training fits. */
  ialsEpsilon?: number;
  /** iALS sweeps of the final training. */
  iterations: number;
  seed: number;
  /** Validation customers `measure` scores (a term of every trial's predicted cost). */
  customers: number;
  threads?: number;
  signal?: AbortSignal;
  /** The clock the trials' elapsed times are read from (default performance.now); it decides nothing. */
  now?: () => number;
  /** Before each fit: the model, the trial's number and the share of the pool spent so far. */
  onTrial: (model: GridModel, trial: number, spentShare: number) => void;
  /** Popularity's and content's half-life searches (half-life-search.ts), run on a timed log only. */
  halfLives?: HalfLifeSearcher[];
}

export interface ModelSearches {
  tunings: ModelTuning[];
  /** Predicted cost (trial-cost.ts: reference CPU-ms) of one plain fit of the searched models, and of the search's trials. */
  plainMs: number;
  spentMs: number;
  notes: TunerNote[];
  /** Popularity's and content's half-life searches (none on a log without times). */
  halfLives: HalfLifeTuning[];
}

interface Searcher {
  model: GridModel;
  axes: Axis[];
  start: Point;
  /** Predicted cost of a trial at the point (trial-cost.ts). */
  cost: (p: Point) => number;
  /** Predicted cost of one plain fit (for iALS: the training's sweeps at the start's factors). */
  plain: number;
  fit: (p: Point) => Promise<Scorer>;
  /** The point as training parameters (iALS's confidence axis is two of them); default: as it is. */
  shown?: (p: Point) => Point;
  /**
   * A capacity axis searched last (iALS's factors): each larger value in turn, with `inner` line-searched
   * again from the best so far, while that improves the best. Why: a larger model wants stronger
   * regularisation, so a coordinate step on factors alone, at the λ chosen for fewer factors, judges it
   * unfairly (Online Retail, validation NDCG@20, log α 1: 64 factors λ 10 0.093; 128 factors λ 10 0.092,
   * λ 32 0.100).
   */
  grow?: { axis: string; values: readonly number[]; inner: Axis };
  /**
   * Successive halving's second rung (promote.ts): the screening (search and growth) spends `screenShare` of the
   * model's budget at low fidelity, then the best ⌈n/η⌉ screened settings are fitted at full fidelity with what
   * is left, and the choice is made among those. Each promoted trial is recorded with `tag` added to its setting.
   */
  promote?: { screenShare: number; cost: (p: Point) => number; fit: (p: Point) => Promise<Scorer>; tag: Point };
  /** Told each measured point's score (the fit cache keeps the best-scoring fit). */
  scored?: (p: Point, score: number) => void;
}

/**
 * Fits shared by trials that differ only in the profile half-life: that side only weighs the customer's row in
 * scoring, so the fitted weights are those of a trial already run and such a trial costs a measurement only
 * (trial-cost.ts easeScoreCost, itemKnnScoreCost), charged as such. Two fits are kept, the latest and the best
 * scoring so far (the point the coordinate search moves from), so memory stays at two models. Which fits are kept
 * depends only on the trials' order and scores, so the predicted costs, and the search, stay deterministic.
 */
class ProfileReuse<M extends Scorer> {
  #last: { key: string; model: M } | null = null;
  #best: { key: string; model: M; score: number } | null = null;
  constructor(
    private readonly fitBase: (p: Point) => M,
    private readonly withProfile: (m: M, h: number | null) => M,
  ) {}
  static key(p: Point): string {
    return JSON.stringify(Object.keys(p).filter((k) => k !== 'profileHalfLifeDays').sort().map((k) => [k, p[k]]));
  }
  has(p: Point): boolean {
    const k = ProfileReuse.key(p);
    return this.#last?.key === k || this.#best?.key === k;
  }
  fit(p: Point): M {
    const k = ProfileReuse.key(p);
    const kept = this.#last?.key === k ? this.#last.model : this.#best?.key === k ? this.#best.model : null;
    const model = kept ?? this.fitBase(p);
    this.#last = { key: k, model };
    return this.withProfile(model, halfLifeParam(p['profileHalfLifeDays']));
  }
  scored(p: Point, score: number): void {
    const k = ProfileReuse.key(p);
    if (this.#last?.key === k && (!this.#best || score > this.#best.score + 1e-9)) this.#best = { key: k, model: this.#last.model, score };
  }
}

/**
 * Where iALS's search starts: regularisation 10, not the 0.01 default, since the grid spans 10⁻² to 10³ and the
 * best values measured lie towards its strong end (the demo shop: 100, NDCG@10 0.169 against 0.111 at 0.01), so
 * one or two steps reach them; log confidence with α 1, since heavy-tailed values (one customer with 300,000
 * plays) are what log scaling is for (Hu et al. 2008 §4). The training defaults stay as they were.
 */
export const IALS_SEARCH_START = { regularization: 10, scaling: 'log', alpha: 1 } as const;

export async function searchModels(o: ModelSearchOptions): Promise<ModelSearches> {
  const notes: TunerNote[] = [];
  const fitOpts = o.signal ? { signal: o.signal } : {};
  const items = o.train.cols;
  const searchers: Searcher[] = [];
  const now = o.now ?? (() => performance.now());
  const sizes = costSizes(o.train, o.customers);
  // Recency is searched only when some entry is older than another (a log without times has no ages).
  const timed = hasAges(o.train);
  if (!timed) {
    for (const model of o.useEase ? (['itemknn', 'ease'] as const) : (['itemknn'] as const)) {
      notes.push({ model, text: 'recency half-lives not searched: no signal is older than another (the log has no times)' });
    }
  }
  const recencyAxes = (model: GridModel): Axis[] =>
    timed
      ? RECENCY_PARAMS.filter((n) => (o.fixed[model] as Record<string, unknown> | undefined)?.[n] === undefined).map((name) => ({
          name,
          values: HALF_LIFE_GRID,
          ordered: true,
          refine: true,
          simplest: 'off',
        }))
      : [];
  const recencyStart = (): Point => (timed ? { fitHalfLifeDays: 'off', profileHalfLifeDays: 'off' } : {});

  // item-kNN: "all" is k = the catalogue size; grid values above it are the same as "all".
  const ks = [...new Set(ITEMKNN_GRID.k.map((k) => (k === 'all' ? items : Math.min(k, items))))].sort((a, b) => a - b);
  const knnReuse = new ProfileReuse<ItemKnnModel>(
    (p) =>
      fitItemKnn(
        o.train,
        {
          k: p['k'] as number,
          shrink: p['shrink'] as number,
          values: p['values'] as ValueTransform,
          normalize: p['normalize'] as KnnNormalize,
          fitHalfLifeDays: halfLifeParam(p['fitHalfLifeDays']),
        },
        fitOpts,
      ).model,
    (m, h) => m.withProfileHalfLife(h),
  );
  // Axis order: the recency half-lives first, the fit side before the profile side: the fit half-life changes the
  // similarities themselves (which co-occurrences count), the profile half-life how the fitted lists are read, so
  // each later choice is made for the earlier one. Then the normalisation: it changes how much each history item's
  // list weighs, so k and shrink are then line-searched for the normalisation chosen; searched last, its change
  // would re-open every other axis. Why recency before the normalisation: on Online Retail (validation NDCG@10)
  // the normalisation chosen first ('sum', 0.0764 against 0.0762) then hid the fit half-life's gain (730 days
  // 0.0845, 180 days 0.0801: the walk stopped), which without it reaches 0.107 at 11 days (NDCG@20).
  const knnFirst = ['fitHalfLifeDays', 'profileHalfLifeDays', 'normalize'];
  const rank = (n: string) => (knnFirst.includes(n) ? knnFirst.indexOf(n) : knnFirst.length);
  searchers.push({
    model: 'itemknn',
    axes: [
      ...axesOf('itemknn', { k: ks, shrink: ITEMKNN_GRID.shrink, values: ITEMKNN_GRID.values, normalize: ITEMKNN_GRID.normalize }, o.fixed),
      ...recencyAxes('itemknn'),
    ].sort((a, b) => rank(a.name) - rank(b.name)),
    start: {
      k: Math.min(ITEMKNN_DEFAULTS.k, Math.max(1, items)),
      shrink: ITEMKNN_DEFAULTS.shrink,
      values: ITEMKNN_DEFAULTS.values,
      normalize: ITEMKNN_DEFAULTS.normalize,
      ...recencyStart(),
      ...o.fixed.itemknn,
    },
    cost: (p) => (knnReuse.has(p) ? itemKnnScoreCost(sizes, p['k'] as number) : itemKnnCost(sizes, p['k'] as number)),
    plain: 0, // set below from the start
    fit: async (p) => knnReuse.fit(p),
    scored: (p, score) => knnReuse.scored(p, score),
  });
  if (o.useEase) {
    const easeReuse = new ProfileReuse<EaseModel>(
      (p) =>
        fitEase(
          o.train,
          { ...TRAIN_EASE_DEFAULTS, lambda: p['lambda'] as number, values: p['values'] as ValueTransform, fitHalfLifeDays: halfLifeParam(p['fitHalfLifeDays']) },
          fitOpts,
        ).model,
      (m, h) => m.withProfileHalfLife(h),
    );
    searchers.push({
      model: 'ease',
      // Axis order: the profile half-life first (its trials reuse the fit, so cost a measurement only), then λ and
      // the transform, then the fit half-life (a full fit per trial) with what the budget leaves. Why not the fit
      // side first: at the default budget it then took the fits λ and the transform had before recency (MovieLens
      // 100K: EASE ended at λ 500, presence, test NDCG@20 0.1875, and the validated blend fell to iALS, 0.1664;
      // with this order λ 300, linear, profile 45 days, 0.1993, hybrid 0.2043); on Online Retail the fit side then goes
      // unsearched at that budget (EASE 0.1018 against 0.1244 with fit 45 days first), while the hybrid, led by
      // item-kNN, is the same (0.1375 against 0.1358). λ is refined to quarter decades around its best (the optimum
      // is broad but not flat; common practice, no source).
      axes: [
        ...recencyAxes('ease').filter((a) => a.name === 'profileHalfLifeDays'),
        ...axesOf('ease', { lambda: EASE_GRID.lambda, values: EASE_GRID.values }, o.fixed).map((x) => (x.name === 'lambda' ? { ...x, refine: true } : x)),
        ...recencyAxes('ease').filter((a) => a.name === 'fitHalfLifeDays'),
      ],
      start: { lambda: EASE_DEFAULTS.lambda, values: EASE_DEFAULTS.values, ...recencyStart(), ...o.fixed.ease },
      cost: (p) => (easeReuse.has(p) ? easeScoreCost(sizes) : easeCost(sizes)),
      plain: easeCost(sizes),
      fit: async (p) => easeReuse.fit(p),
      scored: (p, score) => easeReuse.scored(p, score),
    });
  }
  const heldI = (o.fixed.ials ?? {}) as Record<string, unknown>;
  // Axis order: the confidence first (its scaling, then α along a decade grid), then λ: the regularisation that
  // suits a confidence depends on it (the data term of eq. 3 grows with the confidences), so λ is line-searched
  // for the confidence chosen rather than the reverse. On the real log of issue 10 the reverse order settled at
  // λ 100, log α 10 (validation NDCG@20 0.084) and never saw λ 0.1, log α 1 (0.090). α is an ordered axis, not
  // one categorical "scaling α" axis tried in full: its validation quality is close to unimodal along the grid
  // (Online Retail: linear α 0.1…100 0.083, 0.064, 0.036, 0.017; log 0.1…100 0.096, 0.093, 0.069, 0.045), so a line
  // search finds its best in two or three fits where the full scan took eight, and the cycle over the axes
  // re-checks the scaling once α has moved.
  // λ is refined to half decades around its best: its optimum on real data is sharp (Online Retail, validation
  // NDCG@20 at 128 factors, log α 1: λ 10 0.092, λ 32 0.100, λ 100 0.068).
  const byName = new Map(axesOf('ials', IALS_GRID, o.fixed).map((a) => [a.name, a] as const));
  // Factors last, λ searched again at each larger count (Searcher.grow), when both are free.
  const growFactors = heldI['factors'] === undefined && heldI['regularization'] === undefined;
  const ialsAxes: Axis[] = ['scaling', 'alpha', 'regularization', ...(growFactors ? [] : ['factors'])]
    .map((n) => byName.get(n))
    .filter((a): a is Axis => a !== undefined)
    .map((a) => (a.name === 'regularization' ? { ...a, refine: true } : a));
  const ialsStart: Point = {
    scaling: IALS_SEARCH_START.scaling,
    alpha: IALS_SEARCH_START.alpha,
    regularization: IALS_SEARCH_START.regularization,
    factors: IALS_DEFAULTS.factors,
    ...(heldI as Point),
  };
  const ialsParams = (p: Point): Point => ({ regularization: p['regularization']!, alpha: p['alpha']!, scaling: p['scaling']!, factors: p['factors']! });
  const sweeps = Math.min(IALS_SEARCH_ITERATIONS, o.iterations);
  const fitIals = async (p: Point, iterations: number): Promise<Scorer> =>
    (
      await fitIalsThreaded(
        o.train,
        { ...(o.ialsEpsilon !== undefined && { epsilon: o.ialsEpsilon }), ...(ialsParams(p) as Partial<IalsParams>), iterations, seed: o.seed },
        { ...fitOpts, ...(o.threads !== undefined && { threads: o.threads }) },
      )
    ).model;
  searchers.push({
    model: 'ials',
    axes: ialsAxes,
    start: ialsStart,
    // Per sweep, CG touches every observed entry k times and every row's k × k Gram products (trial-cost.ts).
    cost: (p) => ialsCost(sizes, p['factors'] as number, sweeps),
    // A plain fit counts as iterations / sweeps of the start's trials, measurement included, as the budget was
    // defined when it was read from the clock (so 3 plain fits buy what they bought before, e.g. the demo's iALS
    // λ refinement to 32: its `evaluate` NDCG@10 0.126, against 0.094 at λ 10).
    plain: (o.iterations / sweeps) * ialsCost(sizes, ialsStart['factors'] as number, sweeps),
    shown: ialsParams,
    ...(growFactors && {
      grow: { axis: 'factors', values: IALS_GRID.factors, inner: { name: 'regularization', values: halfDecades(IALS_GRID.regularization) } },
    }),
    fit: (p) => fitIals(p, sweeps),
    ...(sweeps < o.iterations && {
      promote: {
        screenShare: ialsScreenShare(o.budget, TUNE_BUDGET.default),
        cost: (p: Point) => ialsCost(sizes, p['factors'] as number, o.iterations),
        fit: (p: Point) => fitIals(p, o.iterations),
        tag: { iterations: o.iterations },
      },
    }),
  });
  if (sweeps < o.iterations) notes.push({ model: 'ials', text: `iALS trials ran ${sweeps} of the ${o.iterations} training sweeps each (a cheaper fit to rank settings)` });

  // 1. The start of every model: its plain cost, and a fitted model even when nothing is searched.
  const trials = new Map<GridModel, GridTrial[]>();
  /** EASE's per-customer NDCG of each trial, by point (the one-standard-error rule below). */
  const easePer = new Map<string, Float64Array>();
  /** Per-customer NDCG of each trial of the models with recency axes, by point (searchKey), for `significant`. */
  const perTrial = new Map<GridModel, Map<string, Float64Array>>([
    ['ease', new Map()],
    ['itemknn', new Map()],
  ]);
  const perCustomer = (model: GridModel, p: Point): Float64Array | undefined => {
    const keep = perTrial.get(model);
    if (!keep) return undefined;
    const per = new Float64Array(o.customers);
    keep.set(searchKey(p), per);
    return per;
  };
  const startScore = new Map<GridModel, EvalResult>();
  const unit = new Map<GridModel, number>();
  let plainMs = 0;
  for (const s of searchers) {
    if (o.signal?.aborted) throw new CancelledError('tuning cancelled');
    o.onTrial(s.model, 1, 0);
    const t0 = now();
    const m = await s.fit(s.start);
    const per = perCustomer(s.model, s.start);
    const r = o.measure(s.model, m, per);
    s.scored?.(s.start, r.ndcg);
    if (per && s.model === 'ease') easePer.set(JSON.stringify(s.start), per);
    const ms = now() - t0;
    startScore.set(s.model, r);
    const shown = s.shown ?? ((p: Point) => p);
    trials.set(s.model, [{ params: shown(s.start), ndcg: r.ndcg, recall: r.cappedRecall, elapsedMs: ms }]);
    if (s.model === 'itemknn') s.plain = s.cost(s.start);
    // What the start cost (iALS's ran `sweeps` of the training's sweeps, so less than its plain fit).
    unit.set(s.model, s.cost(s.start));
    if (!fullyFixed(s.model, o.fixed, timed)) plainMs += s.plain;
  }

  const pool = o.budget * plainMs;
  let spent = searchers.reduce((sum, s) => sum + (fullyFixed(s.model, o.fixed, timed) ? 0 : unit.get(s.model)!), 0);

  // 2. The searches, sharing what is left of the pool.
  const tunings: ModelTuning[] = [];
  const order: GridModel[] = ['ease', 'itemknn', 'ials'];
  const shareOf: Record<GridModel, number> = { ease: 1 / 3, itemknn: 1 / 2, ials: 1 };
  for (const model of order) {
    const s = searchers.find((x) => x.model === model);
    if (!s) continue;
    const fixed = { ...(o.fixed[model] as Point | undefined) };
    if (fullyFixed(model, o.fixed, timed)) {
      tunings.push({ model, trials: [], best: (s.shown ?? ((p: Point) => p))(s.start), ndcg: Number.NaN, fixed, searched: false });
      continue;
    }
    const u = unit.get(model)!;
    const plain = s.plain;
    const budgetMs = Math.max(0, pool - spent) * shareOf[model];
    // With a promotion rung, the screening gets its share and the promotions what the screening leaves.
    const screenMs = budgetMs * (s.promote?.screenShare ?? 1);
    const startKey = JSON.stringify(s.start);
    const evaluate = async (p: Point): Promise<number> => {
      if (JSON.stringify(p) === startKey) return startScore.get(model)!.ndcg;
      const t0 = now();
      const m = await s.fit(p);
      const per = perCustomer(model, p);
      const r = o.measure(model, m, per);
      s.scored?.(p, r.ndcg);
      if (per && model === 'ease') easePer.set(JSON.stringify(p), per);
      const list = trials.get(model)!;
      list.push({ params: (s.shown ?? ((x: Point) => ({ ...x })))(p), ndcg: r.ndcg, recall: r.cappedRecall, elapsedMs: now() - t0 });
      return r.ndcg;
    };
    const found = await coordinateSearch({
      axes: s.axes,
      start: s.start,
      budget: screenMs,
      cost: (p) => (JSON.stringify(p) === startKey ? 0 : s.cost(p)),
      ...(o.signal && { signal: o.signal }),
      onTrial: (t) => o.onTrial(model, t.trial, pool > 0 ? Math.min(1, (spent + t.spent) / pool) : 1),
      evaluate,
      significant: (candidate, incumbent) => {
        const per = perTrial.get(model);
        const a = per?.get(searchKey(candidate));
        const b = per?.get(searchKey(incumbent));
        return a !== undefined && b !== undefined && significantlyBetter(a, b);
      },
    });
    let searchedSpent = found.spent;
    const grown: number[] = [];
    if (s.grow) {
      // Each larger capacity is tried only while affordable, from the best so far; a larger value that does
      // not beat the best with its own λ ends the stage (validation quality rises, then falls with capacity).
      for (const v of s.grow.values.filter((x) => x > (found.best[s.grow!.axis] as number))) {
        const left = screenMs - searchedSpent;
        const start = { ...found.best, [s.grow.axis]: v };
        if (s.cost(start) > left + 1e-9) {
          found.stopped = 'budget';
          break;
        }
        grown.push(v);
        const offset = searchedSpent;
        const stage = await coordinateSearch({
          axes: [s.grow.inner],
          start,
          budget: left,
          cost: (p) => s.cost(p),
          ...(o.signal && { signal: o.signal }),
          onTrial: (t) => o.onTrial(model, trials.get(model)!.length + 1, pool > 0 ? Math.min(1, (spent + offset + t.spent) / pool) : 1),
          evaluate,
        });
        searchedSpent += stage.spent;
        if (stage.stopped === 'budget') found.stopped = 'budget';
        if (!(stage.score > found.score + 1e-9)) break;
        found.best = stage.best;
        found.score = stage.score;
      }
    }
    if (s.promote) {
      const pr = s.promote;
      const screened = trials.get(model)!.map((t) => ({ point: { ...t.params }, score: t.ndcg }));
      const offset = searchedSpent;
      const rung = await promoteTop({
        screened,
        budget: Math.max(0, budgetMs - searchedSpent),
        cost: pr.cost,
        ...(o.signal && { signal: o.signal }),
        onTrial: (t) => o.onTrial(model, trials.get(model)!.length + 1, pool > 0 ? Math.min(1, (spent + offset + t.spent) / pool) : 1),
        evaluate: async (p) => {
          const t0 = now();
          const r = o.measure(model, await pr.fit(p));
          trials.get(model)!.push({ params: { ...(s.shown ?? ((x: Point) => ({ ...x })))(p), ...pr.tag }, ndcg: r.ndcg, recall: r.cappedRecall, elapsedMs: now() - t0 });
          return r.ndcg;
        },
      });
      searchedSpent += rung.spent;
      if (rung.best) {
        found.best = rung.best.point;
        found.score = rung.best.score;
      }
      if (rung.skipped > 0) found.stopped = 'budget';
      // At or below the default budget the screening takes the whole share (ialsScreenShare = 1), so no refit is
      // expected there: saying that none fitted would be noise on every default training.
      if (rung.best) {
        notes.push({ model: 'ials', text: `iALS: the best ${rung.promoted.length} of ${screened.length} screened settings refitted with all ${o.iterations} sweeps (successive halving, η ${PROMOTE_ETA}); chosen by that score` });
      } else if (pr.screenShare < 1) {
        notes.push({ model: 'ials', text: `iALS: no screened setting could be refitted with all ${o.iterations} sweeps within the budget; chosen by its ${sweeps}-sweep score` });
      }
    }
    if (model === 'ease') {
      const pick = oneStandardErrorUp(found.best, 'lambda', easePer);
      if (pick) {
        notes.push({ model: 'ease', text: pick.note });
        found.best = pick.point;
        found.score = trials.get(model)!.find((t) => JSON.stringify(t.params) === JSON.stringify(pick.point))?.ndcg ?? found.score;
      }
    }
    found.spent = searchedSpent;
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
        axes: Object.fromEntries([
          ...s.axes.map((a): [string, AxisValue[]] => [a.name, [...a.values]]),
          ...(s.grow ? [[s.grow.axis, [s.start[s.grow.axis]!, ...grown]] as [string, AxisValue[]]] : []),
        ]),
        // Both include the start, which was paid from the pool before the search got its share.
        budgetPlainFits: plain > 0 ? (budgetMs + u) / plain : 0,
        spentPlainFits: plain > 0 ? (found.spent + u) / plain : 0,
        stopped: found.stopped,
      },
    });
  }
  // 3. Popularity's and content's half-lives, on a timed log, last: from `budget` × their own plain costs
  // (trial-cost.ts) and whatever the three searches left of their pool, shared in turn (what popularity leaves
  // goes to content), each later search's start kept back for it. Why last and not from the shared pool first:
  // taking their few measurements from it moved EASE's search on the demo shop (NDCG@10 0.150 to 0.142); this way
  // those searches run exactly as before and the whole stays within `budget` × one plain fit of every model.
  const extras = timed ? (o.halfLives ?? []) : [];
  const extrasPlain = extras.reduce((sum, h) => sum + h.plain, 0);
  const extrasPool = o.budget * extrasPlain + Math.max(0, pool - spent);
  let extrasSpent = 0;
  const halfLives: HalfLifeTuning[] = [];
  for (const [q, h] of extras.entries()) {
    if (o.signal?.aborted) throw new CancelledError('tuning cancelled');
    const keptBack = extras.slice(q + 1).reduce((sum, x) => sum + x.cost, 0);
    const r = await searchHalfLife(h, { budget: Math.max(0, extrasPool - extrasSpent - keptBack), customers: o.customers, measure: o.measure, ...(o.signal && { signal: o.signal }) });
    extrasSpent += r.spentMs;
    halfLives.push(r);
  }
  // Grid order of the result: item-kNN, EASE, iALS (as before).
  tunings.sort((a, b) => ['itemknn', 'ease', 'ials'].indexOf(a.model) - ['itemknn', 'ease', 'ials'].indexOf(b.model));
  return { tunings, plainMs: plainMs + extrasPlain, spentMs: spent + extrasSpent, notes, halfLives };
}

/** A decade grid with its geometric midpoints (two significant digits): 10, 32, 100, 320, ... */
export function halfDecades(grid: readonly number[]): number[] {
  const out: number[] = [];
  grid.forEach((v, i) => {
    if (i > 0) out.push(Number(Math.sqrt(grid[i - 1]! * v).toPrecision(2)));
    out.push(v);
  });
  return out;
}

/**
 * The axes of a model's grid given in `grid`, leaving out the parameters the caller fixed (they stay at the
 * caller's value) and those `grid` does not list (the recency axes, added by the caller when the log has times).
 */
function axesOf<M extends GridModel>(model: M, grid: Record<string, readonly (number | string)[]>, fixed: FixedParams): Axis[] {
  const held = (fixed[model] ?? {}) as Record<string, unknown>;
  return (GRID_PARAMS[model] as readonly string[]).filter((p) => held[p] === undefined && grid[p] !== undefined).map((name) => ({ name, values: grid[name]! }));
}

/** The key of a point whatever the order of its parameters (the search's own key, search.ts). */
const searchKey = (p: Point) => JSON.stringify(Object.keys(p).sort().map((k) => [k, p[k]]));

/**
 * Standard errors by which a recency setting must beat "off": 2, about the two-sided 5% bound of a paired z-test
 * (the normal 97.5% quantile 1.96, rounded up). Why not the one standard error of EASE's λ rule: there the rule
 * picks among tied values; here it decides whether to add a parameter at all, after a walk over several
 * half-lives, and on the stationary synthetic logs of test/tune/recency-search.test.ts one standard error let a
 * decayed setting win 8 of 32 model × side choices by chance (two: 3 of 32; measured with a walk over the
 * half-lives, before the scan of every half-life, which with two gives 2 of 32), while on drifting ones both bars
 * found a profile half-life every time.
 */
const SIGNIFICANT_SE = 2;

/**
 * True when `a` beats `b` by more than SIGNIFICANT_SE standard errors of the paired per-customer difference (a
 * paired z-test; the per-customer pairing as in the one-standard-error rule, Hastie, Tibshirani & Friedman, The
 * Elements of Statistical Learning, 2nd ed., §7.10): the simpler model is kept unless the more complex one is
 * better beyond noise. Why for recency: leaving "off" adds a parameter, and on a log where age carries no
 * information a decayed setting still wins validation by chance now and then.
 */
export function significantlyBetter(a: Float64Array, b: Float64Array): boolean {
  const n = a.length;
  if (n < 2 || b.length !== n) return false;
  let sum = 0;
  for (let c = 0; c < n; c++) sum += a[c]! - b[c]!;
  const mean = sum / n;
  let ss = 0;
  for (let c = 0; c < n; c++) ss += (a[c]! - b[c]! - mean) ** 2;
  return mean > SIGNIFICANT_SE * Math.sqrt(ss / (n - 1) / n);
}

/** True when some entry of the matrix is older than another: only then can recency tell entries apart. */
export function hasAges(m: Csr): boolean {
  const a = m.ageDays;
  if (!a || a.length === 0) return false;
  const first = a[0]!;
  for (let p = 1; p < a.length; p++) if (a[p] !== first) return true;
  return false;
}

/**
 * The one-standard-error rule (Hastie, Tibshirani & Friedman, The Elements of Statistical Learning, 2nd ed.,
 * §7.10; the blend's rule too, core/eval/validated-blend.ts): among the settings tried with the best one's other
 * parameters, take the most regularised (largest `axis`) whose validation NDCG lies within one standard error of
 * the best's, the error paired per customer. Why for EASE's λ: its validation curve is flat near the optimum
 * (Online Retail: λ 300 and 500 tie), so which of several tied values wins was decided by the search's start;
 * the rule decides ties on principle, towards the simpler model (a stronger pull of B towards 0). Null when
 * no larger value is within one standard error.
 */
export function oneStandardErrorUp(best: Point, axis: string, perCustomer: ReadonlyMap<string, Float64Array>): { point: Point; note: string } | null {
  const bestPer = perCustomer.get(JSON.stringify(best));
  if (!bestPer || bestPer.length < 2) return null;
  let pick: { point: Point; mean: number; se: number } | null = null;
  for (const [key, per] of perCustomer) {
    const p = JSON.parse(key) as Point;
    const same = Object.keys(best).every((k) => k === axis || p[k] === best[k]);
    if (!same || !((p[axis] as number) > (best[axis] as number))) continue;
    if (pick && (p[axis] as number) <= (pick.point[axis] as number)) continue;
    const n = per.length;
    let sum = 0;
    for (let c = 0; c < n; c++) sum += per[c]! - bestPer[c]!;
    const mean = sum / n;
    let ss = 0;
    for (let c = 0; c < n; c++) ss += (per[c]! - bestPer[c]! - mean) ** 2;
    const se = Math.sqrt(ss / (n - 1) / n);
    if (mean >= -se) pick = { point: p, mean, se };
  }
  if (!pick) return null;
  return {
    point: pick.point,
    note: `EASE λ ${pick.point[axis]} chosen over ${best[axis]} by the one-standard-error rule (validation NDCG ${pick.mean.toFixed(4)} ± ${pick.se.toFixed(4)} against it)`,
  };
}
