/**
 * The side-by-side table of the quality benchmark and the checks of DESIGN.md's quality targets:
 * every model ≥ 1.00× its reference (NDCG@K), the hybrid ≥ the best single model, default `train` ≥ 0.95× the
 * tuned best. Beside each ratio, when per-customer figures are given, the paired standard error of the
 * difference on the test customers (paired.ts), so a close call reads as one.
 */
export interface Metrics {
  ndcg: number;
  recall: number;
}

export interface QualityInput {
  k: number;
  /** Ours after `train --tune`, by model name (content, itemknn, ials, ease, popularity, hybrid). */
  tuned: Record<string, Metrics> | null;
  /** Ours after plain `train`. */
  plain: Record<string, Metrics> | null;
  /** The numpy/scipy reference, by model name. */
  reference: Record<string, Metrics> | null;
  /** Per-customer NDCG@K (tuned ours, the reference), for the paired standard errors beside the ratios. */
  tunedPer?: Record<string, PerCustomer> | null;
  referencePer?: Record<string, PerCustomer> | null;
}

import { pairedDifference, type PerCustomer } from './paired.ts';

export const SINGLE_MODELS = ['popularity', 'itemknn', 'ials', 'ease', 'content'] as const;

const f4 = (x: number | undefined): string => (x === undefined || Number.isNaN(x) ? '—' : x.toFixed(4));
const ratio = (a: number | undefined, b: number | undefined): number | undefined => (a === undefined || b === undefined || b === 0 ? undefined : a / b);
const fx = (x: number | undefined): string => (x === undefined ? '—' : `${x.toFixed(2)}×`);
/** The paired standard error of a − b as a share of b's mean ("±0.012"), '' when either side lacks per-customer figures. */
const seOfRatio = (a: PerCustomer | undefined, b: PerCustomer | undefined, bMean: number | undefined): string => {
  if (!a || !b || !bMean) return '';
  const d = pairedDifference(a, b);
  return Number.isNaN(d.se) ? '' : `±${(d.se / bMean).toFixed(3)}`;
};

export interface Target {
  name: string;
  value: number | undefined;
  bound: number;
  met: boolean | null;
}

export function qualityTable(q: QualityInput): { text: string; targets: Target[] } {
  const lines: string[] = [];
  const pad = (s: string, n: number) => s.padStart(n);
  lines.push(
    `${'model'.padEnd(11)}${pad(`NDCG@${q.k} ours`, 16)}${pad('reference', 11)}${pad('ratio', 8)}${pad('paired SE', 10)}${pad(`Recall@${q.k} ours`, 18)}${pad('reference', 11)}${pad('ratio', 8)}${pad('plain train', 13)}${pad('plain/tuned', 13)}`,
  );
  const targets: Target[] = [];
  for (const m of [...SINGLE_MODELS, 'hybrid']) {
    const t = q.tuned?.[m];
    const r = q.reference?.[m];
    const p = q.plain?.[m];
    const rn = ratio(t?.ndcg, r?.ndcg);
    lines.push(
      `${m.padEnd(11)}${pad(f4(t?.ndcg), 16)}${pad(f4(r?.ndcg), 11)}${pad(fx(rn), 8)}${pad(seOfRatio(q.tunedPer?.[m], q.referencePer?.[m], r?.ndcg), 10)}${pad(f4(t?.recall), 18)}${pad(f4(r?.recall), 11)}${pad(fx(ratio(t?.recall, r?.recall)), 8)}${pad(f4(p?.ndcg), 13)}${pad(fx(ratio(p?.ndcg, t?.ndcg)), 13)}`,
    );
    if (m !== 'hybrid') targets.push({ name: `${m} ≥ 1.00× reference (NDCG@${q.k})`, value: rn, bound: 1, met: rn === undefined ? null : rn >= 1 - 1e-9 });
  }
  const bestSingle = (set: Record<string, Metrics> | null) =>
    set ? SINGLE_MODELS.map((m) => ({ m, v: set[m]?.ndcg ?? Number.NaN })).filter((x) => !Number.isNaN(x.v)).sort((a, b) => b.v - a.v)[0] : undefined;
  const best = bestSingle(q.tuned);
  const hybrid = q.tuned?.hybrid?.ndcg;
  const hr = ratio(hybrid, best?.v);
  lines.push('');
  const hse = best ? seOfRatio(q.tunedPer?.hybrid, q.tunedPer?.[best.m], best.v) : '';
  lines.push(`hybrid vs best single model (tuned): ${f4(hybrid)} vs ${best?.m ?? '—'} ${f4(best?.v)} = ${fx(hr)}${hse ? ` ${hse} (paired SE over the test customers)` : ''}`);
  targets.push({ name: 'hybrid ≥ best single model (tuned)', value: hr, bound: 1, met: hr === undefined ? null : hr >= 1 - 1e-9 });
  const bestOf = (set: Record<string, Metrics> | null) => (set ? Math.max(...Object.values(set).map((x) => x.ndcg)) : undefined);
  const tunedBest = bestOf(q.tuned);
  const plainBest = bestOf(q.plain);
  const pr = ratio(plainBest, tunedBest);
  lines.push(`plain train's best vs tuned best: ${f4(plainBest)} vs ${f4(tunedBest)} = ${fx(pr)}`);
  targets.push({ name: 'plain train ≥ 0.95× tuned best', value: pr, bound: 0.95, met: pr === undefined ? null : pr >= 0.95 });
  lines.push('');
  for (const t of targets) lines.push(`${t.met === null ? 'n/a ' : t.met ? 'met ' : 'MISS'}  ${t.name}: ${fx(t.value)}`);
  if (q.tunedPer) lines.push('paired SE: the standard error of the per-customer NDCG difference, as a share of the second mean (a ratio within about 2 SE of 1.00× is a tie)');
  const met = targets.filter((t) => t.met).length;
  lines.push(`targets: ${met} of ${targets.length} met`);
  return { text: lines.join('\n'), targets };
}
