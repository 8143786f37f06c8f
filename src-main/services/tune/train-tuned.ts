/**
 * `train --tune`: tune on a validation split (tune.ts, in its own thread), refit every model with its best setting on all
 * signals in the training thread (train/train-job.ts), and store each model's grid results with it (the
 * model's evaluation record, key `tuning`). Nothing is written until training has finished; a cancel
 * during tuning or training writes nothing.
 */
import { plural } from '../../core/util/plural.ts';
import { CancelledError } from '../../core/errors.ts';
import { ModelRepo } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';
import type { JobBody } from '../jobs.ts';
import { trainAndSave, type TrainSummary } from '../train/train-job.ts';
import type { TrainOptions } from '../train/train-models.ts';
import { tuneInThread } from './offline-thread.ts';
import type { TuneOptions, TuneResult } from './tune.ts';

/** Share of the progress bar taken by tuning (it fits about 20 models; training fits 5). */
const TUNE_SHARE = 0.75;

export interface TunedTraining {
  summary: TrainSummary;
  tuning: TuneResult;
}

export async function tuneAndTrain(
  db: Db,
  file: string,
  options: TrainOptions,
  tune: Omit<TuneOptions, 'signal' | 'onProgress'>,
  report: (p: { stage: string; fraction: number; model?: string; iteration?: number; iterations?: number }) => void,
  signal: AbortSignal,
): Promise<TunedTraining> {
  const tuning = await tuneInThread(
    file,
    {
      ...tune,
      ...(options.threads !== undefined && { threads: options.threads }),
      // Trials run as many sweeps as the final training will.
      ...(options.params?.ials?.iterations !== undefined && tune.iterations === undefined && { iterations: options.params.ials.iterations }),
    },
    {
      signal,
      onProgress: (p) => report({ stage: 'tune', model: p.model, iteration: p.trial, iterations: p.trials, fraction: p.fraction * TUNE_SHARE }),
    },
  );
  if (signal.aborted) throw new CancelledError('training cancelled');
  const params = {
    ...options.params,
    itemknn: { ...tuning.params.itemknn, ...options.params?.itemknn },
    ials: { ...tuning.params.ials, ...options.params?.ials },
    ...((tuning.params.ease || options.params?.ease) && { ease: { ...tuning.params.ease, ...options.params?.ease } }),
  };
  const summary = await trainAndSave(db, file, { ...options, params }, {
    signal,
    onProgress: (p) => report({ ...p, fraction: TUNE_SHARE + (1 - TUNE_SHARE) * p.fraction }),
  });
  storeTuning(db, summary, tuning);
  return { summary, tuning };
}

/** Stores each model's grid with the model just trained (one transaction). */
export function storeTuning(db: Db, summary: TrainSummary, tuning: TuneResult): void {
  const repo = new ModelRepo(db);
  const common = { k: tuning.k, seed: tuning.seed, split: tuning.split, tunedAt: Date.now() };
  db.transaction(() => {
    summary.models.forEach((kind, q) => {
      const grid = tuning.models.find((m) => m.model === kind);
      const hybrid = tuning.models.find((m) => m.model === 'hybrid');
      if (kind === 'content' && hybrid) {
        repo.setEvaluation(summary.ids[q]!, { tuning: { ...common, hybridContentWeight: tuning.hybridContentWeight, grid: hybrid } });
      } else if (grid) repo.setEvaluation(summary.ids[q]!, { tuning: { ...common, grid } });
    });
  })();
}

export function tunedTrainJob(db: Db, file: string, options: TrainOptions, tune: Omit<TuneOptions, 'signal' | 'onProgress'> = {}): JobBody {
  return async (report, signal) => {
    const { summary, tuning } = await tuneAndTrain(db, file, options, tune, report, signal);
    const best = tuning.models.map((m) => `${m.model} NDCG@${tuning.k} ${m.ndcg.toFixed(3)}`).join(', ');
    return `tuned (${tuning.split.method} split; ${best}) and trained ${plural(summary.models.length, 'model')} in ${((tuning.elapsedMs + summary.elapsedMs) / 1000).toFixed(1)} s`;
  };
}
