/**
 * Editorial dials that have nothing to read in a workspace: trend needs signals with a time, freshness items with a
 * date added. A shop's export of counts (customer, item, count) has neither; such a dial is left out of the blend
 * (its weight goes to the others) and is said in words wherever the dials are shown.
 */
export const IDLE_DIALS = ['trend', 'freshness'] as const;
export type IdleDial = (typeof IDLE_DIALS)[number];

/** Why each idle dial reads nothing, in words. */
export function idleDialWords(idle: readonly IdleDial[]): string[] {
  return idle.map((d) =>
    d === 'trend'
      ? 'Trend is left out: no signal has a time, so no item can be seen rising.'
      : 'Freshness is left out: no item has a date added, so none can be told new.',
  );
}
