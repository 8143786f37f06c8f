/**
 * Backtest replay of a plan on history: for each replayed week [start, start + 7 days), of the audience
 * members active that week, how many engaged with (had any signal on) an item planned for that week. The
 * horizon's share pools the weeks: Σ engaged / Σ active (a member counts once per week they were active).
 */
import { DAY_MS, type SignalColumns } from '../types.ts';

export interface ReplayWeek {
  start: number;
  active: number;
  engaged: number;
}

export interface Replay {
  weeks: ReplayWeek[];
  share: number;
}

/** member: 1 for customers in the audience; itemsByWeek: dense items planned each week (any shelf). */
export function replayPlan(signals: SignalColumns, customers: number, member: Uint8Array, starts: readonly number[], itemsByWeek: readonly Int32Array[], items: number): Replay {
  const weeks: ReplayWeek[] = [];
  const active = new Int32Array(customers);
  const engaged = new Int32Array(customers);
  const onList = new Uint8Array(items);
  starts.forEach((start, w) => {
    const end = start + 7 * DAY_MS;
    onList.fill(0);
    for (const i of itemsByWeek[w]!) if (i >= 0) onList[i] = 1;
    // Marks with the week number + 1, so the arrays need no clearing between weeks.
    const mark = w + 1;
    let a = 0;
    let e = 0;
    for (let k = 0; k < signals.length; k++) {
      const t = signals.at[k]!;
      if (!(t >= start && t < end)) continue;
      const u = signals.customer[k]!;
      if (!member[u]) continue;
      if (active[u] !== mark) {
        active[u] = mark;
        a++;
      }
      if (onList[signals.item[k]!] && engaged[u] !== mark) {
        engaged[u] = mark;
        e++;
      }
    }
    weeks.push({ start, active: a, engaged: e });
  });
  let a = 0;
  let e = 0;
  for (const x of weeks) {
    a += x.active;
    e += x.engaged;
  }
  return { weeks, share: a === 0 ? NaN : e / a };
}
