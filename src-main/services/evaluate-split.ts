/**
 * Where `evaluate` cuts train | validation | test, by time or per customer at random.
 *
 * - By time (the default whenever the signals carry it: the tuner's rule, tune/split.ts `timesCarrySplit`): a
 *   global temporal split at quantiles of signal time (core/matrix/split.ts), which stands for "recommend now".
 * - Per customer at random (a shop's export of counts with no times, or a log where most signals lack one): the
 *   tuner's seeded per-customer holdout (tune/split.ts `randomHoldout`) applied twice, first for test from all
 *   signals, then for validation from what is left, so every customer with enough items keeps history in train.
 *   It measures "find the items a customer also has", not "the next ones": no later window exists to measure.
 *
 * `choice` 'auto' takes time when it can and says why when it cannot; 'time' asked of signals that cannot carry it
 * is refused (an InputError on the field `split`), never quietly replaced.
 */
import type { SplitChoice } from '../core/eval/split-choice.ts';
import { InputError } from '../core/errors.ts';
import { quantileCuts, splitByTime, type TimeCuts } from '../core/matrix/split.ts';
import type { Dataset } from '../core/types.ts';
import { signalTimeCoverage } from '../store/stats.ts';
import type { Db } from '../store/workspace.ts';
import { noTimeSplitWords, randomHoldout, timeCoverage, timesCarrySplit, tooLittleToTune, type TimeCoverage } from './tune/split.ts';

export type { SplitChoice } from '../core/eval/split-choice.ts';

/**
 * Each customer's share of distinct items held out for test, then of the rest for validation: the tuner's share
 * (tune/split.ts default 0.2), so `evaluate` and tuning hold out alike (common practice, no source).
 */
export const RANDOM_HOLDOUT_SHARE = 0.2;

export interface EvaluationSplit {
  method: 'time' | 'random';
  train: Int32Array;
  validation: Int32Array;
  test: Int32Array;
  /** The time cuts (method 'time'), else null. */
  cuts: TimeCuts | null;
  /** Which split was used and why, in words. */
  why: string;
}

/** What a time split needs and the signals lack, in words; null when the counts alone allow one. */
export function timeSplitRefusal(c: TimeCoverage): string | null {
  if (c.timed >= 3) return null;
  return `a split by time needs at least 3 signals with a time, and ${c.timed === 0 ? `none of the ${c.signals.toLocaleString('en')} has one` : `only ${c.timed} of ${c.signals.toLocaleString('en')} have one`}: choose the random per-customer split, or leave the choice to the data`;
}

/**
 * Refuses, before any job starts, a split by time asked of a workspace whose signals have too few times (one
 * count in SQL): the request is wrong, so it fails at once rather than as a job. Times that exist but do not
 * spread into two windows are found by the evaluation itself (`evaluationSplit`), with the same field.
 */
export function refuseImpossibleSplit(db: Db, choice: SplitChoice): void {
  if (choice !== 'time') return;
  const refusal = timeSplitRefusal(signalTimeCoverage(db));
  if (refusal) throw new InputError(refusal, { column: 'split' });
}

export function evaluationSplit(ds: Dataset, choice: SplitChoice, o: { cuts?: TimeCuts; seed: number }): EvaluationSplit {
  const coverage = timeCoverage(ds);
  const wantTime = o.cuts !== undefined || choice === 'time' || (choice === 'auto' && timesCarrySplit(coverage));
  if (wantTime) {
    const refusal = o.cuts ? null : timeSplitRefusal(coverage);
    if (refusal) throw new InputError(refusal, { column: 'split' });
    const cuts = o.cuts ?? quantileCuts(ds);
    const split = splitByTime(ds, cuts);
    if (split.validation.length > 0 && split.test.length > 0) {
      const untimed = coverage.signals - coverage.timed;
      const why = `by time: test from ${isoDay(cuts.testFrom)}, validation from ${isoDay(cuts.validationFrom)}` +
        (untimed > 0 ? ` (${untimed.toLocaleString('en')} signals without a time stay in train)` : '');
      return { method: 'time', ...split, cuts, why };
    }
    if (choice !== 'auto' || o.cuts) {
      throw new InputError('the signals\' times do not spread enough to leave a validation and a test window: choose the random per-customer split', { column: 'split' });
    }
    return random(ds, o.seed, 'the signals\' times do not spread enough to leave a validation and a test window');
  }
  return random(ds, o.seed, choice === 'random' ? 'asked for' : noTimeSplitWords(coverage));
}

function random(ds: Dataset, seed: number, because: string): EvaluationSplit {
  let first, second;
  try {
    first = randomHoldout(ds, RANDOM_HOLDOUT_SHARE, seed);
    second = randomHoldout(ds, RANDOM_HOLDOUT_SHARE, seed + 1, first.train);
  } catch (e) {
    // The tuner's refusal speaks of tuning; here nothing can be held out to evaluate on.
    if (tooLittleToTune(e)) throw new InputError('no customer has two or more items (left): nothing can be held out to evaluate on');
    throw e;
  }
  const why = `per customer at random (${because}): ${Math.round(RANDOM_HOLDOUT_SHARE * 100)}% of each customer's items held out for test, then ${Math.round(RANDOM_HOLDOUT_SHARE * 100)}% of the rest for validation`;
  return { method: 'random', train: second.train, validation: second.validation, test: first.validation, cuts: null, why };
}

const isoDay = (t: number): string => new Date(t).toISOString().slice(0, 10);
