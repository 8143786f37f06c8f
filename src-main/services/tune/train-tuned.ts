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
import { dataFingerprint, ModelRepo, modelStatus } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';
import type { JobBody, JobProgress } from '../jobs.ts';
import { TUNE_BUDGET } from '../../core/models/tune-budget.ts';
import { waitingLine } from '../../store/write-lock.ts';
import { STALE_NOTE } from '../train/save-run.ts';
import { announceOutlook, trainAndSave, type TrainSummary } from '../train/train-job.ts';
import type { TrainOptions } from '../train/train-models.ts';
import { fixedParams, GRID_PARAMS, halfLifeParam, RECENCY_PARAMS, type GridModel } from './grid.ts';
import { tuneInThread } from './offline-thread.ts';
import { tooLittleToTune } from './split.ts';
import type { ModelTuning, TuneOptions, TuneResult } from './tune.ts';

/** Share of the progress bar taken by tuning (it fits about 20 models; training fits 5). */
const TUNE_SHARE = 0.75;

export interface TunedTraining {
  summary: TrainSummary;
  tuning: TuneResult;
}

/** How train.start asks for tuning: always, or only when the data changed since the last tuning (item 5). */
export type TuneRequest = Omit<TuneOptions, 'signal' | 'onProgress' | 'fixed'> & { when?: 'always' | 'changed' };

/**
 * Training when nobody says how to tune (issue 10 item 5, "good by default"): tune when the data changed since
 * the last tuning, else train that tuning's settings again. The one default for every way in: the app's Train
 * button and `shelfwright train` both leave `tune` out of train.start.
 */
export const DEFAULT_TUNE: TuneRequest = { k: 10, when: 'changed' };

/** A tuning as stored with a model (the model's evaluation record, key `tuning`). */
interface StoredTuning {
  fingerprint?: string;
  grid?: { model: string; best: Record<string, number | string> };
}

/**
 * Popularity's and content's half-life search as stored with the model (evaluation record, key
 * `halfLifeTuning`: not `tuning`, whose readers expect a grid): half-life-search.ts HalfLifeTuning.
 */
interface StoredHalfLife {
  fingerprint?: string;
  halfLife?: { param: string; best: number | null };
}

/**
 * The settings of the last tuning when it saw exactly the data the workspace holds now, else null: every
 * current model of a searched kind must carry a tuning record with today's data fingerprint (a model trained
 * later without tuning, or any change to items or signals, means tuning again).
 */
export function reusableTuning(
  db: Db,
  kinds: readonly string[],
): {
  params: NonNullable<TrainOptions['params']>;
  records: Map<string, unknown>;
  halfLifeRecords: Map<string, unknown>;
  notes: Map<string, string[]>;
} | null {
  const now = dataFingerprint(db);
  const current = modelStatus(db);
  const records = new Map<string, unknown>();
  const halfLifeRecords = new Map<string, unknown>();
  // The tuner's notes go along with its settings (EASE's "not tuned" has no record of its own to ride on).
  const notes = new Map<string, string[]>();
  const params: Record<string, Record<string, number | string | null>> = {};
  // Content has no grid (its weight in the hybrid is the validated blend's, learned at every training).
  for (const kind of ['itemknn', 'ials', 'ease'] as const) {
    if (!kinds.includes(kind)) continue;
    const m = current.find((x) => x.kind === kind);
    const ev = m?.evaluation as { tuning?: StoredTuning; tunerNotes?: string[] } | null | undefined;
    const t = ev?.tuning;
    if (ev?.tunerNotes?.length) notes.set(kind, ev.tunerNotes);
    if (!t) {
      if (kind === 'ease') continue; // EASE is not tuned above its item limit
      return null;
    }
    if (t.fingerprint !== now) return null;
    records.set(kind, t);
    if (t.grid) {
      const grid = GRID_PARAMS[kind as GridModel] as readonly string[];
      // A half-life's 'off' is the training parameter null.
      params[kind] = Object.fromEntries(
        Object.entries(t.grid.best)
          .filter(([key]) => grid.includes(key))
          .map(([key, v]) => [key, (RECENCY_PARAMS as readonly string[]).includes(key) ? halfLifeParam(v) : v]),
      );
    }
  }
  // Popularity's and content's half-lives, when their record saw today's data (else off, as before they were tuned).
  for (const kind of ['popularity', 'content'] as const) {
    if (!kinds.includes(kind)) continue;
    const t = (current.find((x) => x.kind === kind)?.evaluation as { halfLifeTuning?: StoredHalfLife } | null | undefined)?.halfLifeTuning;
    if (!t?.halfLife || t.fingerprint !== now) continue;
    halfLifeRecords.set(kind, t);
    params[kind] = { [t.halfLife.param]: t.halfLife.best };
  }
  return { params: params as NonNullable<TrainOptions['params']>, records, halfLifeRecords, notes };
}

export async function tuneAndTrain(
  db: Db,
  file: string,
  options: TrainOptions,
  request: TuneRequest,
  report: (p: JobProgress) => void,
  signal: AbortSignal,
): Promise<TunedTraining | { summary: TrainSummary; reused: true } | { summary: TrainSummary; untuned: string }> {
  const { when, ...tune } = request;
  const kinds = options.models ?? ['content', 'itemknn', 'ials', 'ease', 'popularity'];
  const reuse = when === 'changed' ? reusableTuning(db, kinds) : null;
  if (reuse) {
    // The data is as the last tuning saw it: train its settings again (the caller's own flags still win).
    const p = options.params ?? {};
    const params = {
      ...p,
      itemknn: { ...reuse.params.itemknn, ...p.itemknn },
      ials: { ...reuse.params.ials, ...p.ials },
      ...((reuse.params.ease || p.ease) && { ease: { ...reuse.params.ease, ...p.ease } }),
      ...((reuse.params.popularity || p.popularity) && { popularity: { ...reuse.params.popularity, ...p.popularity } }),
      ...((reuse.params.content || p.content) && { content: { ...reuse.params.content, ...p.content } }),
    };
    // Waiting for another process's write shows in the job's stage, as in a plain or a tuned training.
    announceOutlook(db, options, 0, report);
    const summary = await trainAndSave(db, file, { ...options, params }, { signal, onProgress: report, onWait: (holder) => report({ stage: waitingLine(holder), fraction: 1 }) });
    const repo = new ModelRepo(db);
    db.transaction(() => {
      summary.models.forEach((kind, q) => {
        const t = reuse.records.get(kind);
        const tunerNotes = reuse.notes.get(kind);
        if (t || tunerNotes) repo.setEvaluation(summary.ids[q]!, { ...(t !== undefined && { tuning: t }), ...(tunerNotes && { tunerNotes }) });
        const h = reuse.halfLifeRecords.get(kind);
        if (h) repo.setEvaluation(summary.ids[q]!, { halfLifeTuning: h });
      });
    })();
    return { summary, reused: true };
  }
  const fixed = fixedParams(options.params);
  announceOutlook(db, options, tune.budget ?? TUNE_BUDGET.default, report);
  let tuning: TuneResult;
  try {
    tuning = await tuneInThread(
      file,
      {
        ...tune,
        // The caller's own grid parameters are held during the search, not only applied afterwards.
        ...(Object.keys(fixed).length && { fixed }),
        // A half-life the caller gave for popularity or content is trained as given, not searched.
        ...(options.params?.popularity?.fitHalfLifeDays !== undefined && { popularityHalfLife: false }),
        ...(options.params?.content?.profileHalfLifeDays !== undefined && { contentHalfLife: false }),
        ...(options.threads !== undefined && { threads: options.threads }),
        // Trials run as many sweeps as the final training will.
        ...(options.params?.ials?.iterations !== undefined && tune.iterations === undefined && { iterations: options.params.ials.iterations }),
      },
      {
        signal,
        // A budgeted search does not know its trial count in advance (trials 0): the bar's fraction is its spend.
        onProgress: (p) =>
          report({ stage: 'tune', model: p.model, ...(p.trials > 0 && { iteration: p.trial, iterations: p.trials }), fraction: p.fraction * TUNE_SHARE }),
      },
    );
  } catch (e) {
    // The default (tune when the data changed) must still train a shop too small to hold out a validation
    // split, with the default settings; asked to tune outright, the refusal stands.
    if (when !== 'changed' || !tooLittleToTune(e)) throw e;
    const summary = await trainAndSave(db, file, options, { signal, onProgress: report, onWait: (holder) => report({ stage: waitingLine(holder), fraction: 1 }) });
    return { summary, untuned: e.message };
  }
  if (signal.aborted) throw new CancelledError('training cancelled');
  // The grid's best already holds the caller's fixed values; the caller's other parameters (iterations...) are added.
  const params = {
    ...options.params,
    itemknn: { ...tuning.params.itemknn, ...options.params?.itemknn },
    ials: { ...tuning.params.ials, ...options.params?.ials },
    ...((tuning.params.ease || options.params?.ease) && { ease: { ...tuning.params.ease, ...options.params?.ease } }),
    ...((tuning.params.popularity || options.params?.popularity) && { popularity: { ...tuning.params.popularity, ...options.params?.popularity } }),
    ...((tuning.params.content || options.params?.content) && { content: { ...tuning.params.content, ...options.params?.content } }),
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

/**
 * Stores each model's grid with the model just trained (one transaction), and the tuner's notes about that
 * model (key `tunerNotes`): a model left out of the search (EASE above its item limit) has notes but no grid.
 */
export function storeTuning(db: Db, summary: TrainSummary, tuning: TuneResult): void {
  const repo = new ModelRepo(db);
  // The fingerprint of the data trained on, which the tuning read in the same state (both run on this
  // workspace back to back; a change in between shows as a later mismatch and tunes again).
  const common = { k: tuning.k, seed: tuning.seed, split: tuning.split, tunedAt: Date.now(), fingerprint: summary.fingerprint };
  db.transaction(() => {
    summary.models.forEach((kind, q) => {
      const grid = tuning.models.find((m) => m.model === kind);
      const tunerNotes = tuning.notes.filter((n) => n.model === kind).map((n) => n.text);
      const halfLife = (tuning.halfLives ?? []).find((h) => h.model === kind);
      if (grid || tunerNotes.length) {
        repo.setEvaluation(summary.ids[q]!, { ...(grid && { tuning: { ...common, grid } }), ...(tunerNotes.length && { tunerNotes }) });
      } else if (halfLife) repo.setEvaluation(summary.ids[q]!, { halfLifeTuning: { ...common, halfLife } });
    });
  })();
}

const setting = (p: ModelTuning['fixed']) => Object.entries(p).map(([a, b]) => `${a}=${b}`).join(' ');

/**
 * The job summary of a tuned training: each grid's best NDCG (or "not searched" for a model whose every grid
 * parameter the caller fixed), and the values the caller fixed, which every trial of that grid used.
 */
export function tunedSummary(
  summary: Pick<TrainSummary, 'models' | 'elapsedMs'>,
  tuning: Pick<TuneResult, 'k' | 'split' | 'models' | 'elapsedMs'> & Partial<Pick<TuneResult, 'budget'>>,
): string {
  const best = tuning.models.map((m) => (m.searched ? `${m.model} NDCG@${tuning.k} ${m.ndcg.toFixed(3)}` : `${m.model} not searched`)).join(', ');
  const fits = tuning.models.reduce((n, m) => n + m.trials.length, 0);
  const spend = tuning.budget
    ? `; ${plural(fits, 'setting')} tried for ${(tuning.budget.spentMs / Math.max(1, tuning.budget.plainMs)).toFixed(1)} of ${tuning.budget.plainFits} plain fits`
    : '';
  const text = `tuned (${tuning.split.method} split; ${best}${spend}) and trained ${plural(summary.models.length, 'model')} in ${((tuning.elapsedMs + summary.elapsedMs) / 1000).toFixed(1)} s`;
  const fixed = tuning.models
    .filter((m) => Object.keys(m.fixed).length)
    .map((m) => `${m.model} ${setting(m.fixed)}${m.searched ? '' : ' (every setting of its grid, so not searched)'}`);
  return fixed.length ? `${text}; fixed by you: ${fixed.join(', ')}` : text;
}

export function tunedTrainJob(db: Db, file: string, options: TrainOptions, tune: TuneRequest = {}): JobBody {
  return async (report, signal) => {
    const r = await tuneAndTrain(db, file, options, tune, report, signal);
    const after = `${r.summary.blend ? `; hybrid: ${r.summary.blend.reason}` : ''}${r.summary.stale ? `; ${STALE_NOTE}` : ''}`;
    if ('untuned' in r) {
      return `not tuned (${r.untuned}): trained ${plural(r.summary.models.length, 'model')} with the default settings in ${(r.summary.elapsedMs / 1000).toFixed(1)} s${after}`;
    }
    if ('reused' in r) {
      return `not tuned: the data is unchanged since the last tuning, whose settings trained ${plural(r.summary.models.length, 'model')} in ${(r.summary.elapsedMs / 1000).toFixed(1)} s${after}`;
    }
    return `${tunedSummary(r.summary, r.tuning)}${after}`;
  };
}
