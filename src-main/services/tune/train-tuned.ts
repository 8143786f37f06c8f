/**
 * `train --tune`: tune on a validation split (tune.ts, in its own thread), refit every model with its best setting on all
 * signals in the training thread (train/train-job.ts), and store each model's grid results with it (the
 * model's evaluation record, key `tuning`). Nothing is written until training has finished; a cancel
 * during tuning or training writes nothing.
 *
 * A grid parameter the caller gave (e.g. iALS factors) is held at the caller's value during the search, so
 * the other settings are chosen for the value that is trained; the summary lists such values as fixed.
 */
import { plural } from '../../core/util/plural.ts';
import { CancelledError } from '../../core/errors.ts';
import { ModelRepo } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';
import type { JobBody } from '../jobs.ts';
import { waitingLine } from '../../store/write-lock.ts';
import { STALE_NOTE } from '../train/save-run.ts';
import { trainAndSave, type TrainSummary } from '../train/train-job.ts';
import type { TrainOptions } from '../train/train-models.ts';
import { fixedParams } from './grid.ts';
import { tuneInThread } from './offline-thread.ts';
import type { ModelTuning, TuneOptions, TuneResult } from './tune.ts';

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
  const fixed = fixedParams(options.params);
  const tuning = await tuneInThread(
    file,
    {
      ...tune,
      // The caller's own grid parameters are held during the search, not only applied afterwards.
      ...(Object.keys(fixed).length && { fixed }),
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
  // The grid's best already holds the caller's fixed values; the caller's other parameters (iterations...) are added.
  const params = {
    ...options.params,
    itemknn: { ...tuning.params.itemknn, ...options.params?.itemknn },
    ials: { ...tuning.params.ials, ...options.params?.ials },
    ...((tuning.params.ease || options.params?.ease) && { ease: { ...tuning.params.ease, ...options.params?.ease } }),
  };
  // The validated blend is learned on the tuner's own split (same seed and cut-off).
  const blend = { ...(tune.k !== undefined && { k: tune.k }), ...(tune.seed !== undefined && { seed: tune.seed }) };
  const summary = await trainAndSave(db, file, { ...options, params, blend }, {
    signal,
    onProgress: (p) => report({ ...p, fraction: TUNE_SHARE + (1 - TUNE_SHARE) * p.fraction }),
    onWait: (holder) => report({ stage: waitingLine(holder), fraction: 1 }),
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

const setting = (p: ModelTuning['fixed']) => Object.entries(p).map(([a, b]) => `${a}=${b}`).join(' ');

/**
 * The job summary of a tuned training: each grid's best NDCG (or "not searched" for a model whose every grid
 * parameter the caller fixed), and the values the caller fixed, which every trial of that grid used.
 */
export function tunedSummary(summary: Pick<TrainSummary, 'models' | 'elapsedMs'>, tuning: Pick<TuneResult, 'k' | 'split' | 'models' | 'elapsedMs'>): string {
  const best = tuning.models.map((m) => (m.searched ? `${m.model} NDCG@${tuning.k} ${m.ndcg.toFixed(3)}` : `${m.model} not searched`)).join(', ');
  const text = `tuned (${tuning.split.method} split; ${best}) and trained ${plural(summary.models.length, 'model')} in ${((tuning.elapsedMs + summary.elapsedMs) / 1000).toFixed(1)} s`;
  const fixed = tuning.models
    .filter((m) => Object.keys(m.fixed).length)
    .map((m) => `${m.model} ${setting(m.fixed)}${m.searched ? '' : ' (every setting of its grid, so not searched)'}`);
  return fixed.length ? `${text}; fixed by you: ${fixed.join(', ')}` : text;
}

export function tunedTrainJob(db: Db, file: string, options: TrainOptions, tune: Omit<TuneOptions, 'signal' | 'onProgress'> = {}): JobBody {
  return async (report, signal) => {
    const { summary, tuning } = await tuneAndTrain(db, file, options, tune, report, signal);
    return `${tunedSummary(summary, tuning)}${summary.stale ? `; ${STALE_NOTE}` : ''}`;
  };
}
