/**
 * What a training run will cost, said before it starts: on a large log (hundreds of thousands of customers,
 * tens of thousands of items, millions of signals) a run takes many minutes, and the editor should hear that,
 * and how to bound it, up front rather than after a quarter of an hour.
 *
 * Predicted from the workspace's counts alone (read in milliseconds), with the work terms of the methods'
 * own loops and the per-unit CPU costs of services/tune/trial-cost.ts (fitted on this machine class):
 * - EASE (Steck 2019): the dense inverse, n³ over the items it fits (at most the training's item limit), fitted
 *   twice, once for the model and once on the validation split the blend is learned on.
 * - iALS (Hu et al. 2008, conjugate gradient per Takács et al. 2011) per sweep: (m + n)·k² + nnz·k, with the
 *   signal count standing for nnz (an upper bound: repeats of one pair are one entry); fitted twice likewise.
 * - item-kNN (Sarwar et al. 2001): Σ_u |r_u|², at least (Σ_u |r_u|)² / m by Cauchy–Schwarz (the counts do not
 *   give the rows' lengths, so this part is a lower bound).
 * The figure is a rough guide (within a factor of about two on the logs measured in bench/scale), never a limit.
 */
import { plural } from '../../core/util/plural.ts';
import { EASE_MAX_ITEMS } from './ease-limit.ts';

export interface OutlookSizes {
  items: number;
  customers: number;
  signals: number;
}

export interface OutlookOptions {
  /** Models trained (default all). */
  models?: readonly string[];
  /** Tuning searches first: its budget in plain fits (0 = no tuning). */
  tuneBudget?: number;
  factors?: number;
  iterations?: number;
  /** Items EASE fits at most (default the training's limit). */
  easeItems?: number;
}

export interface TrainingOutlook {
  /** Predicted CPU seconds of the whole run, by part. */
  cpuSeconds: number;
  parts: { part: 'ease' | 'ials' | 'itemknn' | 'tuning'; cpuSeconds: number }[];
  /** Said to the editor when the run is long (over LONG_CPU_SECONDS), else null. */
  notice: string | null;
}

/** A run predicted above this many CPU seconds is announced (common practice, no source: a wait worth a word). */
export const LONG_CPU_SECONDS = 120;

// Seconds per unit of work: trial-cost.ts's reference CPU-ms per million units, / 1e9.
const EASE_CUBE = 0.035e-9;
const IALS_GRAM = 1e-9;
const IALS_ENTRY = 22e-9;
const PAIRS = 3.8e-9;

export function trainingOutlook(s: OutlookSizes, o: OutlookOptions = {}): TrainingOutlook {
  const has = (m: string) => o.models === undefined || o.models.includes(m);
  const easeItems = Math.min(s.items, o.easeItems ?? EASE_MAX_ITEMS);
  const factors = o.factors ?? 64;
  const sweeps = o.iterations ?? 15;
  const parts: TrainingOutlook['parts'] = [];
  // Twice: the model itself, and the refit on the validation split that the blend is learned on (tune/blend.ts).
  if (has('ease')) parts.push({ part: 'ease', cpuSeconds: 2 * EASE_CUBE * easeItems ** 3 });
  if (has('ials')) {
    const sweep = IALS_GRAM * (s.customers + s.items) * factors * factors + IALS_ENTRY * s.signals * factors;
    parts.push({ part: 'ials', cpuSeconds: 2 * sweeps * sweep });
  }
  if (has('itemknn') && s.customers > 0) parts.push({ part: 'itemknn', cpuSeconds: (2 * PAIRS * s.signals * s.signals) / s.customers });
  const plain = parts.reduce((a, p) => a + p.cpuSeconds / 2, 0);
  if ((o.tuneBudget ?? 0) > 0) parts.push({ part: 'tuning', cpuSeconds: (o.tuneBudget ?? 0) * plain });
  const cpuSeconds = parts.reduce((a, p) => a + p.cpuSeconds, 0);
  return { cpuSeconds, parts, notice: cpuSeconds > LONG_CPU_SECONDS ? noticeFor(s, easeItems, cpuSeconds, parts) : null };
}

const minutes = (sec: number) => (sec < 90 ? `${Math.max(1, Math.round(sec))} CPU-s` : `${Math.round(sec / 60)} CPU-min`);

function noticeFor(s: OutlookSizes, easeItems: number, total: number, parts: TrainingOutlook['parts']): string {
  const of = (p: TrainingOutlook['parts'][number]['part']) => parts.find((x) => x.part === p)?.cpuSeconds ?? 0;
  const what = [
    of('ease') > 0 ? `EASE's dense inverse over ${easeItems.toLocaleString('en')}${easeItems < s.items ? ` of the ${s.items.toLocaleString('en')}` : ''} items ${minutes(of('ease'))}` : '',
    of('ials') > 0 ? `iALS ${minutes(of('ials'))}` : '',
    of('itemknn') > 60 ? `item-kNN at least ${minutes(of('itemknn'))}` : '',
    of('tuning') > 0 ? `tuning first up to ${minutes(of('tuning'))}` : '',
  ].filter(Boolean);
  const quicker = [of('tuning') > 0 ? 'without tuning' : '', of('ease') > of('ials') / 2 ? 'without EASE' : '', of('ials') > 0 ? 'iALS with fewer factors' : ''].filter(Boolean);
  return (
    `a large workspace (${plural(s.items, 'item')}, ${plural(s.customers, 'customer')}, ${plural(s.signals, 'signal')}): ` +
    `this training needs roughly ${minutes(total)} (about ${Math.max(1, Math.round(total / 2 / 60))} min on two idle cores): ${what.join('; ')}` +
    (quicker.length ? `. Quicker: ${quicker.join(', ')}` : '')
  );
}
