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

/** One grid setting that the caller's own parameter replaced in the final training. */
export interface TunedOverride {
  model: 'itemknn' | 'ials' | 'ease';
  param: string;
  /** The value trained with (the caller's). */
  used: number | string;
  /** The grid's best, which was not used. */
  best: number | string;
}

/**
 * The grid's best settings that the caller's own parameters overrode: tuneAndTrain trains with the caller's
 * value wherever one was given, so the grid's best is then only what the search found, not what was trained.
 */
export function tunedOverrides(params: TrainOptions['params'], tuning: Pick<TuneResult, 'models'>): TunedOverride[] {
  const out: TunedOverride[] = [];
  for (const m of tuning.models) {
    if (m.model === 'hybrid') continue;
    const given = params?.[m.model] as Record<string, unknown> | undefined;
    for (const [param, best] of Object.entries(m.best)) {
      const used = given?.[param];
      if ((typeof used === 'number' || typeof used === 'string') && used !== best) out.push({ model: m.model, param, used, best });
    }
  }
  return out;
}

/** The job summary of a tuned training: the grid results, and any setting of the caller's that was trained instead. */
export function tunedSummary(summary: Pick<TrainSummary, 'models' | 'elapsedMs'>, tuning: TuneResult, overrides: readonly TunedOverride[]): string {
  const best = tuning.models.map((m) => `${m.model} NDCG@${tuning.k} ${m.ndcg.toFixed(3)}`).join(', ');
  const text = `tuned (${tuning.split.method} split; ${best}) and trained ${plural(summary.models.length, 'model')} in ${((tuning.elapsedMs + summary.elapsedMs) / 1000).toFixed(1)} s`;
  if (!overrides.length) return text;
  const given = overrides.map((o) => `${o.model} ${o.param}=${o.used} (the grid's best was ${o.best})`).join(', ');
  return `${text}; trained with your own ${given}`;
}

export function tunedTrainJob(db: Db, file: string, options: TrainOptions, tune: Omit<TuneOptions, 'signal' | 'onProgress'> = {}): JobBody {
  return async (report, signal) => {
    const { summary, tuning } = await tuneAndTrain(db, file, options, tune, report, signal);
    const trained = new Set<string>(summary.models);
    return tunedSummary(summary, tuning, tunedOverrides(options.params, tuning).filter((o) => trained.has(o.model)));
  };
}
