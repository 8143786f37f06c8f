/**
 * The invented customers: an id (C000123), a generic region and a join date. Each belongs to one
 * hidden taste group and keeps it for the whole window (stable taste), with one or two favourite
 * categories inside the group and an activity level drawn from a heavy-tailed law.
 */
import type { Rng } from '../../src-main/core/rng.ts';
import { DAY_S, EARLIEST_JOIN_S, WINDOW_END_S, WINDOW_START_S } from './calendar.ts';
import { assignGroups, pickWeighted } from './sampling.ts';
import { CATEGORIES, GROUPS, REGIONS, type Category } from './scenario.ts';

export interface DemoCustomer {
  id: string;
  region: string;
  joinedS: number;
  /** Signals fall in [activeFromS, activeToS). */
  activeFromS: number;
  activeToS: number;
  /** Relative number of interactions (log-normal, so a few customers are very active). */
  activity: number;
  /** Index into GROUPS. */
  group: number;
  /** Bit c set when CATEGORIES[c] is a favourite. */
  favourites: number;
}

const REGION_WEIGHTS = [1.2, 1.3, 1.0, 1.0, 0.9, 1.6, 0.5, 0.3];
/** Share of customers who joined before the signal window opened. */
const EARLY_SHARE = 0.35;
/** Share of customers who stop visiting before the window closes. */
const CHURN_SHARE = 0.2;

export function generateCustomers(rng: Rng, n: number): DemoCustomer[] {
  const groups = assignGroups(
    rng,
    n,
    GROUPS.map((g) => g.customerShare),
  );
  const window = WINDOW_END_S - WINDOW_START_S;
  const out: DemoCustomer[] = [];
  for (let k = 0; k < n; k++) {
    const group = groups[k]!;
    let joinedS: number;
    if (rng.next() < EARLY_SHARE) {
      joinedS = EARLIEST_JOIN_S + Math.floor(rng.next() * (WINDOW_START_S - EARLIEST_JOIN_S));
    } else {
      // sqrt(u): sign-ups grow over time; nobody joins in the last two weeks.
      joinedS = WINDOW_START_S + Math.floor(Math.sqrt(rng.next()) * (window - 14 * DAY_S));
    }
    joinedS -= joinedS % DAY_S;
    const activeFromS = Math.max(joinedS, WINDOW_START_S);
    const activeToS =
      rng.next() < CHURN_SHARE
        ? activeFromS + Math.floor((0.2 + 0.8 * rng.next()) * (WINDOW_END_S - activeFromS))
        : WINDOW_END_S;
    const spec = GROUPS[group]!;
    const cats = Object.keys(spec.categories) as Category[];
    const weights = cats.map((c) => spec.categories[c]!);
    let favourites = 1 << CATEGORIES.indexOf(cats[pickWeighted(rng, weights)]!);
    if (rng.next() < 0.5) favourites |= 1 << CATEGORIES.indexOf(cats[pickWeighted(rng, weights)]!);
    out.push({
      id: 'C' + String(k + 1).padStart(6, '0'),
      region: REGIONS[pickWeighted(rng, REGION_WEIGHTS)]!,
      joinedS,
      activeFromS,
      activeToS,
      activity: Math.exp(0.9 * rng.normal()) * ((activeToS - activeFromS) / window),
      group,
      favourites,
    });
  }
  return out;
}
