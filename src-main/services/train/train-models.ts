import { buildInteractionMatrix, type BuildOptions } from '../../core/matrix/build.ts';
import { signalUnit } from '../../core/matrix/signal-unit.ts';
import { fitContent, type ContentParams } from '../../core/models/content.ts';
import { EASE_DEFAULTS, fitEase, type EaseParams } from '../../core/models/ease.ts';
import type { IalsParams } from '../../core/models/ials-params.ts';
import { fitItemKnn, type ItemKnnParams } from '../../core/models/itemknn.ts';
import { fitPopularity, type PopularityParams } from '../../core/models/popularity.ts';
import type { FitReport, ModelKind, Scorer } from '../../core/models/scorer.ts';
import type { Dataset } from '../../core/types.ts';
import { loadDataset } from '../../store/dataset.ts';
import type { ValidatedBlend } from '../../core/eval/validated-blend.ts';
import { erasureGeneration } from '../../store/erasure.ts';
import { dataFingerprint, ModelRepo, type ModelRecord, type ModelSummary } from '../../store/models.ts';
import { learnBlend } from '../tune/blend.ts';
import type { Db } from '../../store/workspace.ts';
import { easeItemLimit, EASE_MAX_ITEMS } from './ease-limit.ts';
import { fitEaseInThread } from './ease-thread.ts';
import { defaultThreads, fitIalsThreaded } from './ials-threads.ts';

/** The kinds a training run fits and stores (the random baseline is built on demand, never stored). */
export type TrainedKind = Exclude<ModelKind, 'random'>;
export const MODEL_KINDS: readonly TrainedKind[] = ['content', 'itemknn', 'ials', 'ease', 'popularity'];

export interface TrainOptions {
  /** Which models to train (default all five). */
  models?: readonly TrainedKind[];
  matrix?: Omit<BuildOptions, 'rows' | 'window'>;
  params?: { content?: ContentParams; itemknn?: ItemKnnParams; ials?: Partial<IalsParams>; ease?: EaseParams; popularity?: PopularityParams };
  /** Threads for iALS (default: the machine's cores); with more than one, EASE also fits in a thread of its own. */
  threads?: number;
  /** The validated blend's split and cut-off (services/tune/blend.ts); false skips it (the blend then stays as it was). */
  blend?: { k?: number; seed?: number } | false;
}

/**
 * EASE's inverse is dense (float32 WebAssembly SIMD, n³/2 multiply-adds: seconds at 5,000 items, minutes at
 * 20,000), so by default catalogues above 20,000 items, or above what free memory holds (ease-limit.ts),
 * fit EASE on their most active items (a note says so).
 */
export const TRAIN_EASE_DEFAULTS: EaseParams = { maxItems: EASE_MAX_ITEMS, restrict: true };

export interface TrainProgress {
  /** 'tune': the search before training (services/tune), when training is tuned; 'blend': the validated blend. */
  stage: 'tune' | 'load' | 'matrix' | 'fit' | 'blend' | 'done';
  model?: TrainedKind;
  iteration?: number;
  iterations?: number;
  /** Overall share done, in [0, 1]. */
  fraction: number;
}

export interface TrainOutput {
  fingerprint: string;
  /** The erasure generation the data was read at (store/erasure.ts): saving checks it has not moved. */
  erasureGeneration: number;
  records: ModelRecord[];
  notes: string[];
  elapsedMs: number;
  /** Wall and CPU time of each stage (CPU of the whole process: iALS's worker threads included). */
  timings: StageTiming[];
  /** The validated blend over the models current after this run, learned on the tuner's split; absent when skipped. */
  blend?: ValidatedBlend;
}

export interface StageTiming {
  stage: 'load' | 'matrix' | 'blend' | TrainedKind;
  wallMs: number;
  /** -1 where unknown (a thread's own CPU is read from /proc, Linux only). */
  cpuMs: number;
  /** Fitted in its own thread alongside the later stages: its wall and CPU are that thread's own. */
  inThread?: true;
}

/** CPU milliseconds used by the process so far (every thread). */
const cpuMs = (): number => {
  const c = process.cpuUsage();
  return (c.user + c.system) / 1000;
};

/** Each stage's share of the progress bar, roughly its share of the time on the demo shop. */
const WEIGHT: Record<'load' | 'matrix' | 'blend' | TrainedKind, number> = {
  blend: 0.5,
  load: 0.1,
  matrix: 0.05,
  content: 0.1,
  itemknn: 0.15,
  ials: 0.4,
  ease: 0.15,
  popularity: 0.05,
};

/**
 * Loads the workspace and fits the chosen models; nothing is written (the caller stores the records in
 * one transaction). The dataset, its fingerprint and the erasure generation are read in one read
 * transaction, so the fingerprint describes exactly the data the models saw, and the save can tell
 * whether a customer was erased since.
 */
export async function trainModels(db: Db, opts: TrainOptions, onProgress: (p: TrainProgress) => void): Promise<TrainOutput> {
  const started = performance.now();
  const kinds = MODEL_KINDS.filter((k) => (opts.models ?? MODEL_KINDS).includes(k));
  const total = WEIGHT.load + WEIGHT.matrix + kinds.reduce((s, k) => s + WEIGHT[k], 0) + (opts.blend === false ? 0 : WEIGHT.blend);
  let doneShare = 0;
  const report = (p: Omit<TrainProgress, 'fraction'>, within = 0, weight = 0) =>
    onProgress({ ...p, fraction: Math.min(1, (doneShare + within * weight) / total) });

  const timings: StageTiming[] = [];
  let mark = { wall: performance.now(), cpu: cpuMs() };
  const lap = (stage: StageTiming['stage']) => {
    const now = { wall: performance.now(), cpu: cpuMs() };
    timings.push({ stage, wallMs: now.wall - mark.wall, cpuMs: now.cpu - mark.cpu });
    mark = now;
  };
  report({ stage: 'load' });
  let fingerprint = '';
  let generation = 0;
  let ds: Dataset | undefined;
  let stored: ModelSummary[] = [];
  // A read transaction (deferred): it must not take the write lock when the connection can write.
  db.transaction(() => {
    generation = erasureGeneration(db);
    fingerprint = dataFingerprint(db);
    ds = loadDataset(db);
    stored = new ModelRepo(db).list().filter((m) => m.current);
  }).deferred();
  const data = ds!;
  lap('load');
  doneShare += WEIGHT.load;
  report({ stage: 'matrix' });
  const matrix = buildInteractionMatrix(data, opts.matrix ?? {});
  lap('matrix');
  doneShare += WEIGHT.matrix;

  // EASE's inverse is the longest single-threaded stage: with two or more threads it starts now in a
  // thread of its own and overlaps the other models (ease-thread.ts); it is collected in its turn.
  // iALS's log confidence counts in ordinary signals (core/matrix/signal-unit.ts) unless ε is given.
  const given = opts.params ?? {};
  const p = kinds.includes('ials') ? { ...given, ials: { epsilon: signalUnit(data, opts.matrix?.kindWeights), ...given.ials } } : given;
  const limit = easeItemLimit();
  const easeParams = { ...TRAIN_EASE_DEFAULTS, values: EASE_DEFAULTS.values, maxItems: limit.maxItems, fitHalfLifeDays: null, profileHalfLifeDays: null, ...p.ease };
  const easeNotes = limit.note && p.ease?.maxItems === undefined && matrix.cols > limit.maxItems ? [limit.note] : [];
  const threads = opts.threads ?? defaultThreads();
  const easeThread = kinds.includes('ease') && threads > 1 ? fitEaseInThread(matrix, easeParams, threads) : null;

  const records: ModelRecord[] = [];
  const notes: string[] = [];
  const keep = (kind: TrainedKind, params: object, fit: { model: Scorer; report: FitReport }) => keepBytes(kind, params, fit.report, fit.model.serialize());
  const keepBytes = (kind: TrainedKind, params: object, fitReport: FitReport, bytes: Uint8Array) => {
    records.push({
      kind,
      params: { ...params },
      fingerprint,
      trainedAt: Date.now(),
      trainMs: fitReport.elapsedMs,
      report: {
        notes: fitReport.notes,
        ...(fitReport.iterations !== undefined ? { iterations: fitReport.iterations } : {}),
        ...(fitReport.losses !== undefined ? { losses: fitReport.losses } : {}),
      },
      bytes,
    });
    notes.push(...fitReport.notes);
  };

  try {
    for (const kind of kinds) {
      report({ stage: 'fit', model: kind });
      if (kind === 'content') {
        const fit = fitContent(data.items, p.content);
        keep(kind, { ...p.content, profileHalfLifeDays: fit.model.profileHalfLifeDays }, fit);
      }
      else if (kind === 'itemknn') {
        const fit = fitItemKnn(matrix, p.itemknn);
        // Stored even when defaulted (recency null = off), so `models` shows what scores.
        keep(kind, { ...p.itemknn, values: fit.model.values, normalize: fit.model.normalize, ...fit.model.recency }, fit);
      }
      else if (kind === 'popularity') {
        const fit = fitPopularity(matrix, 'presence', p.popularity?.fitHalfLifeDays ?? null);
        keep(kind, { fitHalfLifeDays: fit.model.fitHalfLifeDays }, fit);
      }
      else if (kind === 'ease' && easeThread) {
        const fit = await easeThread.done;
        keepBytes(kind, easeParams, { ...fit.report, notes: [...easeNotes, ...fit.report.notes] }, fit.bytes);
        timings.push({ stage: kind, wallMs: fit.report.elapsedMs, cpuMs: fit.cpuMs, inThread: true });
        mark = { wall: performance.now(), cpu: cpuMs() }; // the wait is not a stage of this thread
      } else if (kind === 'ease') {
        const fit = fitEase(matrix, easeParams);
        keep(kind, easeParams, { ...fit, report: { ...fit.report, notes: [...easeNotes, ...fit.report.notes] } });
      }
      else {
        const fit = await fitIalsThreaded(matrix, p.ials ?? {}, {
          threads,
          onIteration: (it) =>
            report({ stage: 'fit', model: 'ials', iteration: it.iteration, iterations: it.iterations }, it.iteration / it.iterations, WEIGHT.ials),
        });
        keep(kind, fit.model.params, fit);
      }
      if (!(kind === 'ease' && easeThread)) lap(kind);
      doneShare += WEIGHT[kind];
    }
  } finally {
    easeThread?.stop();
  }
  let blend: ValidatedBlend | undefined;
  if (opts.blend !== false) {
    // Over every model that is current once this run is stored: this run's, and the others as stored.
    report({ stage: 'blend' });
    const params: NonNullable<TrainOptions['params']> = {};
    for (const m of stored) if (!kinds.includes(m.kind as TrainedKind)) (params as Record<string, unknown>)[m.kind] = m.params;
    Object.assign(params, p);
    const all = MODEL_KINDS.filter((k) => kinds.includes(k) || stored.some((m) => m.kind === k));
    blend = await learnBlend(data, all, params, { ...opts.blend, threads, ...(opts.matrix && { matrix: opts.matrix }) });
    lap('blend');
  }
  onProgress({ stage: 'done', fraction: 1 });
  return { fingerprint, erasureGeneration: generation, records, notes, elapsedMs: performance.now() - started, timings, ...(blend && { blend }) };
}
