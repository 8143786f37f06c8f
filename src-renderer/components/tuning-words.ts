import { TUNE_BUDGET } from '../../src-main/core/models/tune-budget.ts';
import type { ModelInfo } from '../state/models-slice.ts';
import { momentWords, num } from './format.ts';

/**
 * Training and tuning in words for the Models screen: what the Train button will do, and how each model's
 * settings were chosen. The decisions themselves are the api's (services/tune/train-tuned.ts); these only say them.
 */

/**
 * Grid parameters as "k 7, shrink 10, values presence; recency half-life 22 days when learning, off for the
 * customer's own items" — the two half-lives (core/models/recency.ts) said in words, the rest as name and value.
 */
const settings = (p: Record<string, number | string | null>): string => {
  const { fitHalfLifeDays: fit, profileHalfLifeDays: profile, ...rest } = p;
  const plain = Object.entries(rest)
    .map(([a, b]) => `${a} ${b}`)
    .join(', ');
  if (fit === undefined && profile === undefined) return plain;
  const days = (h: number | string | null | undefined) => (typeof h === 'number' ? `${h} days` : 'off');
  const recency =
    days(fit) === 'off' && days(profile) === 'off'
      ? 'no recency weighting'
      : `recency half-life ${days(fit)} when learning, ${days(profile)} for the customer's own items`;
  return plain ? `${plain}; ${recency}` : recency;
};

/**
 * Would the api's default training reuse the last tuning (services/tune/train-tuned.ts reusableTuning)? It does
 * when every current item-kNN and iALS model, and EASE when it was tuned, carries a tuning that saw today's data.
 * Here "today's data" is read as "the model is not stale and its tuning kept a fingerprint": a model is stale
 * exactly when the data changed since it was trained, and a tuning is stored with the data it was trained on.
 */
export function reusesTuning(models: readonly ModelInfo[]): boolean {
  const fresh = (m: ModelInfo | undefined) => m !== undefined && !m.stale && m.tuning?.fingerprint !== undefined;
  const ease = models.find((m) => m.kind === 'ease');
  return fresh(models.find((m) => m.kind === 'itemknn')) && fresh(models.find((m) => m.kind === 'ials')) && (!ease?.tuning || fresh(ease));
}

/** One sentence: what pressing Train will do, with or without the search (`skip`: the api's `tune: false`). */
export function trainingPlan(models: readonly ModelInfo[], skip: boolean): string {
  if (skip) {
    return "Will train every model with its default settings, without searching: quicker. The next training without this tick searches again.";
  }
  if (reusesTuning(models)) return "The data is unchanged since the last tuning: will train that tuning's settings again, without searching.";
  return (
    `${models.some((m) => m.tuning) ? 'The data changed since the last tuning' : 'Nothing is tuned yet'}: will first search each model's settings on ` +
    `held-out signals, spending at most ${TUNE_BUDGET.default} times what one plain training of the searched models costs, then train every model on all signals.`
  );
}

/** How a model's settings were chosen, in a phrase ("–" for a model with no search of its own). */
export function tuningSummary(m: ModelInfo): string {
  const t = m.tuning;
  if (!t) return m.tuningNotes.length ? 'Not tuned' : '–';
  if (t.grid.searched === false) return `Settings fixed by hand (${settings(t.grid.best)}); not searched`;
  return `${settings(t.grid.best)} · NDCG@${t.k} ${num(t.grid.ndcg, 3)} on held-out signals · tuned ${momentWords(t.tunedAt)}`;
}

/**
 * The job's notice (services/train/outlook.ts) as the screen says it: the main side's sentence, capitalised,
 * and which of its quicker ways this screen offers (only skipping the search; the others are the command line's).
 */
export function noticeWords(notice: string): { text: string; quicker: string | null } {
  const text = `${notice.charAt(0).toUpperCase()}${notice.slice(1)}.`;
  // The notice offers "without tuning" only when this run searches first (outlook.ts counts tuning only then).
  const here = notice.includes('without tuning') ? 'To leave the search out, cancel, tick “Skip tuning” and train again.' : '';
  const elsewhere = /without EASE|fewer factors/.test(notice)
    ? 'Leaving EASE out or giving iALS fewer factors is done from the command line: shelfwright train --models … --factors N.'
    : '';
  const quicker = [here, elsewhere].filter(Boolean).join(' ');
  return { text, quicker: quicker || null };
}
