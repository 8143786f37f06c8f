/**
 * What a workspace's dates can support, read once per world: signals with a time (trend, backtests, "bought in the
 * last N days", the planner's seasons) and items with a date added (freshness, ages, "new this week"). A shop's
 * export of counts has neither; then the dials that read them are neutral, and this says so in words.
 */
import type { IdleDial } from '../../core/curation/idle-dials.ts';
import type { CurationWorld } from './world.ts';

export interface TimeCoverage {
  signals: number;
  timedSignals: number;
  items: number;
  datedItems: number;
}

export function timeCoverageOf(world: Pick<CurationWorld, 'ds' | 'memo'>): TimeCoverage {
  const key = 'time-coverage';
  const known = world.memo.get(key) as TimeCoverage | undefined;
  if (known) return known;
  const s = world.ds.signals;
  let timedSignals = 0;
  for (let k = 0; k < s.length; k++) if (s.at[k] === s.at[k]) timedSignals++;
  let datedItems = 0;
  for (const it of world.ds.items) if (it.addedAt !== null) datedItems++;
  const c = { signals: s.length, timedSignals, items: world.ds.items.length, datedItems };
  world.memo.set(key, c);
  return c;
}

/** The dials that have nothing to read here: trend without timed signals, freshness without dated items. */
export function idleDials(c: TimeCoverage): IdleDial[] {
  const idle: IdleDial[] = [];
  if (c.signals > 0 && c.timedSignals === 0) idle.push('trend');
  if (c.items > 0 && c.datedItems === 0) idle.push('freshness');
  return idle;
}
