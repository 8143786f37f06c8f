import { buildInteractionMatrix, type BuildOptions } from '../../core/matrix/build.ts';
import { fitContent, type ContentParams } from '../../core/models/content.ts';
import { fitEase, type EaseParams } from '../../core/models/ease.ts';
import type { IalsParams } from '../../core/models/ials-params.ts';
import { fitItemKnn, type ItemKnnParams } from '../../core/models/itemknn.ts';
import { fitPopularity } from '../../core/models/popularity.ts';
import type { FitReport, ModelKind, Scorer } from '../../core/models/scorer.ts';
import type { Dataset } from '../../core/types.ts';
import { loadDataset } from '../../store/dataset.ts';
import { dataFingerprint, type ModelRecord } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';
import { fitIalsThreaded } from './ials-threads.ts';

/** The kinds a training run fits and stores (the random baseline is built on demand, never stored). */
export type TrainedKind = Exclude<ModelKind, 'random'>;
export const MODEL_KINDS: readonly TrainedKind[] = ['content', 'itemknn', 'ials', 'ease', 'popularity'];

export interface TrainOptions {
  /** Which models to train (default all five). */
  models?: readonly TrainedKind[];
  matrix?: Omit<BuildOptions, 'rows' | 'window'>;
  params?: { content?: ContentParams; itemknn?: ItemKnnParams; ials?: Partial<IalsParams>; ease?: EaseParams };
  /** Threads for iALS (default: the machine's cores). */
  threads?: number;
}

/**
 * EASE's inverse is dense and its Cholesky costs n³/3: on a 2-core machine 5,000 items take tens of
 * seconds, so by default larger catalogues fit EASE on their 5,000 most active items (a note says so).
 */
export const TRAIN_EASE_DEFAULTS: EaseParams = { maxItems: 5_000, restrict: true };

export interface TrainProgress {
  stage: 'load' | 'matrix' | 'fit' | 'done';
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
}

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

  report({ stage: 'load' });
  let fingerprint = '';
  let ds: Dataset | undefined;
  db.transaction(() => {
    fingerprint = dataFingerprint(db);
    ds = loadDataset(db);
  })();
  const data = ds!;
  doneShare += WEIGHT.load;
  report({ stage: 'matrix' });
  const matrix = buildInteractionMatrix(data, opts.matrix ?? {});
  doneShare += WEIGHT.matrix;

  const records: ModelRecord[] = [];
  const notes: string[] = [];
  const keep = (kind: TrainedKind, params: object, fit: { model: Scorer; report: FitReport }) => {
    records.push({
      kind,
      params: { ...params },
      fingerprint,
      trainedAt: Date.now(),
      trainMs: fit.report.elapsedMs,
      report: {
        notes: fit.report.notes,
        ...(fit.report.iterations !== undefined ? { iterations: fit.report.iterations } : {}),
        ...(fit.report.losses !== undefined ? { losses: fit.report.losses } : {}),
      },
      bytes: fit.model.serialize(),
    });
    notes.push(...fit.report.notes);
  };

  for (const kind of kinds) {
    report({ stage: 'fit', model: kind });
    const p = opts.params ?? {};
    if (kind === 'content') keep(kind, p.content ?? {}, fitContent(data.items, p.content));
    else if (kind === 'itemknn') keep(kind, p.itemknn ?? {}, fitItemKnn(matrix, p.itemknn));
    else if (kind === 'popularity') keep(kind, {}, fitPopularity(matrix));
    else if (kind === 'ease') {
      const params = { ...TRAIN_EASE_DEFAULTS, ...p.ease };
      keep(kind, params, fitEase(matrix, params));
    } else {
      const fit = await fitIalsThreaded(matrix, p.ials ?? {}, {
        ...(opts.threads !== undefined ? { threads: opts.threads } : {}),
        onIteration: (it) =>
          report({ stage: 'fit', model: 'ials', iteration: it.iteration, iterations: it.iterations }, it.iteration / it.iterations, WEIGHT.ials),
      });
      keep(kind, fit.model.params, fit);
    }
    doneShare += WEIGHT[kind];
  }
  onProgress({ stage: 'done', fraction: 1 });
  return { fingerprint, records, notes, elapsedMs: performance.now() - started };
}
