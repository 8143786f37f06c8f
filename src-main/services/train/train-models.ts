import { buildInteractionMatrix, type BuildOptions } from '../../core/matrix/build.ts';
import { fitContent, type ContentParams } from '../../core/models/content.ts';
import { EASE_DEFAULTS, fitEase, type EaseParams } from '../../core/models/ease.ts';
import type { IalsParams } from '../../core/models/ials-params.ts';
import { fitItemKnn, type ItemKnnParams } from '../../core/models/itemknn.ts';
import { fitPopularity } from '../../core/models/popularity.ts';
import type { FitReport, ModelKind, Scorer } from '../../core/models/scorer.ts';
import type { Dataset } from '../../core/types.ts';
import { loadDataset } from '../../store/dataset.ts';
import { dataFingerprint, type ModelRecord } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';
import { fitEaseInThread } from './ease-thread.ts';
import { defaultThreads, fitIalsThreaded } from './ials-threads.ts';

/** The kinds a training run fits and stores (the random baseline is built on demand, never stored). */
export type TrainedKind = Exclude<ModelKind, 'random'>;
export const MODEL_KINDS: readonly TrainedKind[] = ['content', 'itemknn', 'ials', 'ease', 'popularity'];

export interface TrainOptions {
  /** Which models to train (default all five). */
  models?: readonly TrainedKind[];
  matrix?: Omit<BuildOptions, 'rows' | 'window'>;
  params?: { content?: ContentParams; itemknn?: ItemKnnParams; ials?: Partial<IalsParams>; ease?: EaseParams };
  /** Threads for iALS (default: the machine's cores); with more than one, EASE also fits in a thread of its own. */
  threads?: number;
}

/**
 * EASE's inverse is dense and its Cholesky costs n³/3: on a 2-core machine 5,000 items take tens of
 * seconds, so by default larger catalogues fit EASE on their 5,000 most active items (a note says so).
 */
export const TRAIN_EASE_DEFAULTS: EaseParams = { maxItems: 5_000, restrict: true };

export interface TrainProgress {
  /** 'tune': the search before training (services/tune), when training is tuned. */
  stage: 'tune' | 'load' | 'matrix' | 'fit' | 'done';
  model?: TrainedKind;
  iteration?: number;
  iterations?: number;
  /** Overall share done, in [0, 1]. */
  fraction: number;
}

export interface TrainOutput {
  fingerprint: string;
  records: ModelRecord[];
  notes: string[];
  elapsedMs: number;
  /** Wall and CPU time of each stage (CPU of the whole process: iALS's worker threads included). */
  timings: StageTiming[];
}

export interface StageTiming {
  stage: 'load' | 'matrix' | TrainedKind;
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
const WEIGHT: Record<'load' | 'matrix' | TrainedKind, number> = {
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
 * one transaction). The dataset and its fingerprint are read in one read transaction, so the fingerprint
 * describes exactly the data the models saw.
 */
export async function trainModels(db: Db, opts: TrainOptions, onProgress: (p: TrainProgress) => void): Promise<TrainOutput> {
  const started = performance.now();
  const kinds = MODEL_KINDS.filter((k) => (opts.models ?? MODEL_KINDS).includes(k));
  const total = WEIGHT.load + WEIGHT.matrix + kinds.reduce((s, k) => s + WEIGHT[k], 0);
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
  let ds: Dataset | undefined;
  db.transaction(() => {
    fingerprint = dataFingerprint(db);
    ds = loadDataset(db);
  })();
  const data = ds!;
  lap('load');
  doneShare += WEIGHT.load;
  report({ stage: 'matrix' });
  const matrix = buildInteractionMatrix(data, opts.matrix ?? {});
  lap('matrix');
  doneShare += WEIGHT.matrix;

  // EASE's inverse is the longest single-threaded stage: with two or more threads it starts now in a
  // thread of its own and overlaps the other models (ease-thread.ts); it is collected in its turn.
  const p = opts.params ?? {};
  const easeParams = { ...TRAIN_EASE_DEFAULTS, values: EASE_DEFAULTS.values, ...p.ease };
  const threads = opts.threads ?? defaultThreads();
  const easeThread = kinds.includes('ease') && threads > 1 ? fitEaseInThread(matrix, easeParams) : null;

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
      if (kind === 'content') keep(kind, p.content ?? {}, fitContent(data.items, p.content));
      else if (kind === 'itemknn') {
        const fit = fitItemKnn(matrix, p.itemknn);
        keep(kind, { ...p.itemknn, values: fit.model.values }, fit); // the transform is stored even when defaulted
      }
      else if (kind === 'popularity') keep(kind, {}, fitPopularity(matrix));
      else if (kind === 'ease' && easeThread) {
        const fit = await easeThread.done;
        keepBytes(kind, easeParams, fit.report, fit.bytes);
        timings.push({ stage: kind, wallMs: fit.report.elapsedMs, cpuMs: fit.cpuMs, inThread: true });
        mark = { wall: performance.now(), cpu: cpuMs() }; // the wait is not a stage of this thread
      } else if (kind === 'ease') keep(kind, easeParams, fitEase(matrix, easeParams));
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
  onProgress({ stage: 'done', fraction: 1 });
  return { fingerprint, records, notes, elapsedMs: performance.now() - started, timings };
}
