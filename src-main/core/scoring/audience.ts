import type { Audience } from '../curation/types.ts';
import { InputError } from '../errors.ts';
import type { Csr } from '../matrix/csr.ts';
import { IalsModel } from '../models/ials.ts';
import type { Scorer } from '../models/scorer.ts';
import { seededRng } from '../rng.ts';
import { DAY_MS, SIGNAL_KIND_CODE, SIGNAL_KINDS, type Dataset, type SignalKind } from '../types.ts';

/**
 * The customers a shelf is for (DESIGN.md "audience"), as dense customer indices, ascending.
 * - everyone: every customer.
 * - rule: customers with a signal of one of `signalKinds` on an item of `category` in the `withinDays`
 *   days before the edition date (e.g. bought in a category in the last 90 days).
 * - group: customers whose discovered taste group is `group`; `groups` (customer → group) must be given.
 *   A group aimed at by name is the group that carries the name now (`names`, one per group); when none
 *   does, the audience is empty and `missingGroupName` says why, never another group's customers.
 */
export function resolveAudience(
  ds: Dataset,
  audience: Audience,
  editionDate: number,
  groups?: Int32Array,
  names?: readonly (string | null)[],
): Int32Array {
  const nC = ds.customerIds.length;
  if (audience.kind === 'everyone') return Int32Array.from({ length: nC }, (_, u) => u);
  if (audience.kind === 'group') {
    if (!groups) throw new InputError('taste groups have not been discovered yet: train the models first');
    const group = groupOf(audience, names);
    const out: number[] = [];
    if (group >= 0) for (let u = 0; u < nC; u++) if (groups[u] === group) out.push(u);
    return Int32Array.from(out);
  }
  if (!(audience.withinDays > 0)) throw new InputError(`audience rule needs withinDays > 0, got ${audience.withinDays}`);
  const kinds = new Uint8Array(SIGNAL_KINDS.length);
  for (const k of audience.signalKinds) {
    if (!(SIGNAL_KINDS as readonly string[]).includes(k)) {
      throw new InputError(`unknown signal kind '${k}' in the audience rule; known: ${SIGNAL_KINDS.join(', ')}`);
    }
    kinds[SIGNAL_KIND_CODE[k as SignalKind]] = 1;
  }
  const inCategory = new Uint8Array(ds.items.length);
  ds.items.forEach((it, i) => {
    if (it.category === audience.category) inCategory[i] = 1;
  });
  const from = editionDate - audience.withinDays * DAY_MS;
  const s = ds.signals;
  const member = new Uint8Array(nC);
  // With no signal timed at all (a shop's export of counts), the window cannot be placed: the rule reads the
  // whole history instead of reaching no one (`audienceWindowNote` says so). Otherwise an untimed signal is
  // outside every window.
  const anyTime = !s.at.every((t) => t !== t);
  for (let k = 0; k < s.length; k++) {
    const t = s.at[k]!;
    const inWindow = anyTime ? t >= from && t < editionDate : true;
    if (inWindow && kinds[s.kind[k]!] && inCategory[s.item[k]!]) member[s.customer[k]!] = 1;
  }
  const out: number[] = [];
  for (let u = 0; u < nC; u++) if (member[u]) out.push(u);
  return Int32Array.from(out);
}

/** The group a group audience means now: by name when it has one (-1 when no group carries it), else by number. */
export function groupOf(audience: { group: number; name?: string }, names?: readonly (string | null)[]): number {
  if (audience.name === undefined) return audience.group;
  return names ? names.indexOf(audience.name) : -1;
}

/** A rule audience on signals without any time reads the whole history (resolveAudience): the words for it, else null. */
export function audienceWindowNote(audience: Audience, ds: Dataset): string | null {
  if (audience.kind !== 'rule' || ds.signals.length === 0 || !ds.signals.at.every((t) => t !== t)) return null;
  return `no signal has a time, so "the last ${audience.withinDays} days" cannot be placed: the audience is everyone with such a signal in ${audience.category} at any time`;
}

/** Why a brief aimed at a named group reaches no one, in words; null when the audience is not such a case. */
export function missingGroupName(audience: Audience, names?: readonly (string | null)[]): string | null {
  if (audience.kind !== 'group' || audience.name === undefined || groupOf(audience, names) >= 0) return null;
  return `the taste group '${audience.name}' was not found after the last training: choose another audience`;
}

export interface AffinityOptions {
  /** Most customers whose scores are averaged (default 400); larger audiences are sampled. */
  sample?: number;
  seed?: number;
}

export interface AffinityReport {
  /** Customers actually averaged. */
  customersUsed: number;
  /** True when the mean is over the whole audience (no sampling). */
  exact: boolean;
}

/**
 * Audience affinity: the audience's aggregated predicted preference for every item, the mean of
 * `scoreInto` over the audience's customers.
 *
 * For iALS the mean is computed exactly and cheaply: p̂_ui = x_uᵀy_i is linear in x_u, so
 * mean_u p̂_ui = (mean_u x_u)ᵀy_i — one k-vector average and one pass over the item factors, whatever
 * the audience size. For other models (item-kNN, EASE, content) an audience larger than `sample` is
 * sampled uniformly without replacement with `seededRng(seed)`: the mean over 400 customers estimates
 * the audience mean with a standard error of σ/20 per item, well below the spread that percentile
 * normalisation then reads (common practice, no source), and the same seed gives the same shelf.
 * An empty audience gives all zeros.
 */
export function audienceAffinityInto(
  model: Scorer,
  history: Csr,
  audience: Int32Array,
  out: Float32Array,
  options: AffinityOptions = {},
): AffinityReport {
  const n = model.itemCount;
  out.fill(0, 0, n);
  if (audience.length === 0) return { customersUsed: 0, exact: true };
  if (model instanceof IalsModel) {
    const k = model.factors;
    const x = model.customerFactors;
    const mean = new Float64Array(k);
    let used = 0;
    for (const u of audience) {
      if (u < 0 || u >= model.customerCount) continue; // not trained: no factor to average
      for (let f = 0; f < k; f++) mean[f]! += x[u * k + f]!;
      used++;
    }
    if (used === 0) return { customersUsed: 0, exact: true };
    for (let f = 0; f < k; f++) mean[f]! /= used;
    const y = model.itemFactors;
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let f = 0; f < k; f++) s += mean[f]! * y[i * k + f]!;
      out[i] = s;
    }
    return { customersUsed: used, exact: used === audience.length };
  }
  const cap = Math.max(1, Math.floor(options.sample ?? 400));
  let chosen = audience;
  if (audience.length > cap) {
    const rng = seededRng(options.seed ?? 0);
    const pick = Int32Array.from(audience);
    for (let c = 0; c < cap; c++) {
      const j = c + rng.int(pick.length - c);
      const t = pick[c]!;
      pick[c] = pick[j]!;
      pick[j] = t;
    }
    chosen = pick.subarray(0, cap);
  }
  const buf = new Float32Array(n);
  const sum = new Float64Array(n);
  for (const u of chosen) {
    model.scoreInto(u, history, buf);
    for (let i = 0; i < n; i++) sum[i]! += buf[i]!;
  }
  for (let i = 0; i < n; i++) out[i] = sum[i]! / chosen.length;
  return { customersUsed: chosen.length, exact: chosen.length === audience.length };
}
