/**
 * How a fill reports what gave way: one RuleViolation per rule, its reasons joined, and a last check of
 * the finished shelf so that no quota or promoted bound is broken without an entry.
 */
import type { CurationContext } from './context.ts';
import { promotedShares } from './meter.ts';
import type { QuotaCounter } from './quota-counter.ts';
import type { Brief, RuleViolation } from './types.ts';

const EPS = 1e-9;

export class ViolationLog {
  readonly #byRule = new Map<string, string[]>();
  add(rule: string, reason: string): void {
    const list = this.#byRule.get(rule);
    if (list) list.push(reason);
    else this.#byRule.set(rule, [reason]);
  }
  has(rule: string): boolean {
    return this.#byRule.has(rule);
  }
  list(): RuleViolation[] {
    return [...this.#byRule].map(([rule, reasons]) => ({ rule, reason: reasons.join('; ') }));
  }
}

/**
 * The safety net: every quota and promoted bound on the finished shelf, shares taken over its filled
 * slots as the meter reads them. The fill turned count bounds into ceil/floor of share × n slots, so a
 * full shelf that met them in the fill meets them here; an entry appears only for what really broke and
 * was not reported yet (e.g. pins, or a shelf left short).
 */
export function checkFinished(
  ctx: CurationContext,
  slots: Int32Array,
  brief: Brief,
  quotas: QuotaCounter,
  log: ViolationLog,
): void {
  for (const o of quotas.over()) {
    if (!log.has(o.name)) log.add(o.name, `${o.value} has ${o.count} items on the finished shelf`);
  }
  const shares = promotedShares(ctx, slots);
  if (Number.isNaN(shares.count)) return;
  const p = brief.rules.promoted;
  const checks: [string, number | undefined, number, 'min' | 'max'][] = [
    ['promoted.minCount', p.minCount, shares.count, 'min'],
    ['promoted.maxCount', p.maxCount, shares.count, 'max'],
    ['promoted.minExposure', p.minExposure, shares.exposure, 'min'],
    ['promoted.maxExposure', p.maxExposure, shares.exposure, 'max'],
  ];
  for (const [rule, bound, actual, kind] of checks) {
    if (bound === undefined || log.has(rule)) continue;
    const broken = kind === 'min' ? actual < bound - EPS : actual > bound + EPS;
    if (broken) {
      log.add(rule, `the finished shelf has ${(actual * 100).toFixed(1)}% against a ${kind} of ${(bound * 100).toFixed(1)}%`);
    }
  }
}
