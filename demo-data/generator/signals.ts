/**
 * Interactions, session by session. A customer's sessions fall on days drawn from the shop's activity
 * curve; each session starts from an anchor item (a newsletter click, a revisit, a generally popular
 * item, or, most often, an item of the customer's own taste group leaning to their favourite
 * categories), may browse on inside the group, and may lead to basket, purchase, a later rating and,
 * for consumables, repeat purchases weeks later. Views are therefore far more common than purchases,
 * and about nine in ten of a customer's interactions are with their own group's items.
 */
import type { Rng } from '../../src-main/core/rng.ts';
import { SIGNAL_KIND_CODE } from '../../src-main/core/types.ts';
import type { DemoItem } from './catalogue.ts';
import type { DemoCustomer } from './people.ts';
import { DAY_S, HOUR_CUMULATIVE, WINDOW_END_S, WINDOW_START_S, dailyActivity, weekOf, weekStart } from './calendar.ts';
import { FEATURED_PER_GROUP, drawFromGroup, drawPopular, type DemandTables } from './demand.ts';
import { searchCumulative } from './sampling.ts';
import { CATEGORIES, CONSUMABLE, GROUPS, SEASON, type Category } from './scenario.ts';

/** Session mix and funnel rates (illustrative values for a small web shop). */
const P_NEWSLETTER = 0.14;
const P_READ = 0.35;
const P_OWN_FEATURE = 0.85;
const P_REVISIT = 0.15;
const P_GENERAL = 0.24;
const P_BROWSE_ON = 0.55;
const MAX_BROWSE = 5;
const P_BASKET_OWN = 0.14;
const P_BASKET_OTHER = 0.05;
const P_BUY = 0.55;
const P_RATE = 0.3;
const P_REPEAT = 0.5;
const MAX_REPEATS = 6;
/** Chance of keeping a draw outside the customer's favourite categories. */
const P_KEEP_OFF_FAVOURITE = 0.45;
/** Mean signals per session, measured on the default shop; turns a signal budget into sessions. */
const SIGNALS_PER_SESSION = 2.55;
const HISTORY = 16;

/** Ratings from 1 to 5: customers like what fits their taste better. */
const RATING_OWN = [0.01, 0.04, 0.1, 0.35, 0.5];
const RATING_OTHER = [0.1, 0.15, 0.3, 0.3, 0.15];

export const KIND = SIGNAL_KIND_CODE;

/** Signals in columns, in generation order; `at` in whole seconds (UTC). */
export interface SignalTable {
  length: number;
  customer: Int32Array;
  item: Int32Array;
  kind: Uint8Array;
  value: Uint8Array;
  at: Uint32Array;
}

class SignalBuffer implements SignalTable {
  length = 0;
  customer: Int32Array;
  item: Int32Array;
  kind: Uint8Array;
  value: Uint8Array;
  at: Uint32Array;
  constructor(capacity: number) {
    this.customer = new Int32Array(capacity);
    this.item = new Int32Array(capacity);
    this.kind = new Uint8Array(capacity);
    this.value = new Uint8Array(capacity);
    this.at = new Uint32Array(capacity);
  }
  push(c: number, i: number, kind: number, value: number, at: number): void {
    if (at >= WINDOW_END_S) return; // the window is closed: what would happen later is not recorded
    if (this.length === this.at.length) this.grow();
    const k = this.length++;
    this.customer[k] = c;
    this.item[k] = i;
    this.kind[k] = kind;
    this.value[k] = value;
    this.at[k] = at;
  }
  private grow(): void {
    const n = this.at.length * 2;
    const copy = <T extends Int32Array | Uint8Array | Uint32Array>(a: T, make: (n: number) => T): T => {
      const b = make(n);
      b.set(a);
      return b;
    };
    this.customer = copy(this.customer, (m) => new Int32Array(m));
    this.item = copy(this.item, (m) => new Int32Array(m));
    this.kind = copy(this.kind, (m) => new Uint8Array(m));
    this.value = copy(this.value, (m) => new Uint8Array(m));
    this.at = copy(this.at, (m) => new Uint32Array(m));
  }
}

function rating(rng: Rng, own: boolean): number {
  const p = own ? RATING_OWN : RATING_OTHER;
  let u = rng.next();
  for (let v = 0; v < 4; v++) if ((u -= p[v]!) < 0) return v + 1;
  return 5;
}

export function generateSignals(
  rng: Rng,
  items: readonly DemoItem[],
  customers: readonly DemoCustomer[],
  demand: DemandTables,
  target: number,
): SignalTable {
  const out = new SignalBuffer(Math.ceil(target * 1.2) + 16);
  // A group visits more when its categories are in season: the shop-wide curve times the group's
  // category mix of monthly demand, so seasonality moves volume, not only the mix within a group.
  const shopActivity = dailyActivity();
  const groupActivity = GROUPS.map((spec) => {
    const a = new Float64Array(shopActivity.length);
    let max = 0;
    for (let d = 0; d < a.length; d++) {
      const month = new Date((WINDOW_START_S + d * DAY_S) * 1000).getUTCMonth();
      let season = 0;
      for (const [cat, share] of Object.entries(spec.categories) as [Category, number][]) season += share * SEASON[cat][month]!;
      a[d] = shopActivity[d]! * season;
      max = Math.max(max, a[d]!);
    }
    return { daily: a, max };
  });
  /** For each item, the last customer who bought it: durable goods are bought once per customer. */
  const boughtBy = new Int32Array(items.length).fill(-1);
  const hourTotal = HOUR_CUMULATIVE[23]!;
  const totalActivity = customers.reduce((s, c) => s + c.activity, 0);
  const nGroups = GROUPS.length;
  const history = new Int32Array(HISTORY);
  let times = new Float64Array(64);

  for (let c = 0; c < customers.length; c++) {
    const person = customers[c]!;
    const g = person.group;
    const { daily: activity, max: maxActivity } = groupActivity[g]!;
    const endS = Math.min(person.activeToS, WINDOW_END_S);
    // Stochastic rounding keeps the expected total on target at every size.
    const want = (target * person.activity) / totalActivity / SIGNALS_PER_SESSION;
    const sessions = Math.max(1, Math.floor(want) + (rng.next() < want - Math.floor(want) ? 1 : 0));
    if (times.length < sessions) times = new Float64Array(sessions * 2);
    const fromDay = (person.activeFromS - WINDOW_START_S) / DAY_S;
    const toDay = Math.max(fromDay + 1, Math.floor((endS - WINDOW_START_S) / DAY_S));
    for (let s = 0; s < sessions; s++) {
      let day: number;
      do day = fromDay + Math.floor(rng.next() * (toDay - fromDay));
      while (rng.next() * maxActivity > activity[day]!);
      const hour = searchCumulative(HOUR_CUMULATIVE, 0, 24, rng.next() * hourTotal);
      times[s] = WINDOW_START_S + day * DAY_S + hour * 3600 + Math.floor(rng.next() * 3600);
    }
    const sorted = times.subarray(0, sessions).sort();
    let seen = 0;

    /** Draws from the customer's group, leaning to their favourite categories; -1 when none. */
    const drawOwn = (w: number): number => {
      let i = -1;
      for (let tries = 0; tries < 3; tries++) {
        i = drawFromGroup(demand, g, w, rng.next());
        if (i < 0 || (person.favourites >> items[i]!.category) & 1 || rng.next() < P_KEEP_OFF_FAVOURITE) break;
      }
      return i;
    };
    const remember = (i: number): void => {
      history[seen++ % HISTORY] = i;
    };
    /** Basket, purchase, rating and repeat purchases that may follow a view at time t. */
    const funnel = (i: number, t: number): void => {
      const item = items[i]!;
      if (weekOf(t) >= item.outOfStockWeek) return;
      const own = item.group === g;
      const consumable = CONSUMABLE.has(CATEGORIES[item.category]!);
      if (!consumable && boughtBy[i] === c) return;
      if (rng.next() >= (own ? P_BASKET_OWN : P_BASKET_OTHER)) return;
      t += 30 + rng.int(600);
      out.push(c, i, KIND.basket, 1, t);
      if (rng.next() >= P_BUY) return;
      boughtBy[i] = c;
      const quantity = (): number => 1 + (consumable && rng.next() < 0.3 ? 1 + (rng.next() < 0.3 ? 1 : 0) : 0);
      t += 60 + rng.int(900);
      out.push(c, i, KIND.purchase, quantity(), t);
      if (rng.next() < P_RATE) out.push(c, i, KIND.rating, rating(rng, own), t + (2 + rng.int(19)) * DAY_S + rng.int(DAY_S));
      // Consumables run out: the same customer buys the same item again some weeks later.
      for (let r = 0; consumable && r < MAX_REPEATS && rng.next() < P_REPEAT; r++) {
        t += (25 + rng.int(66)) * DAY_S + rng.int(DAY_S);
        if (t >= endS + 30 * DAY_S || weekOf(t) >= item.outOfStockWeek) break;
        out.push(c, i, KIND.view, 1, t);
        out.push(c, i, KIND.basket, 1, t + 40 + rng.int(300));
        out.push(c, i, KIND.purchase, quantity(), t + 400 + rng.int(900));
      }
    };

    for (let s = 0; s < sessions; s++) {
      let t = sorted[s]!;
      let w = weekOf(t);
      let anchor = -1;
      if (rng.next() < P_NEWSLETTER) {
        // The newsletter goes out on Thursday at 07:00; people open it over the next day or so.
        const opened = weekStart(w) + 3 * DAY_S + 7 * 3600 + Math.floor(-Math.log(1 - rng.next()) * 8 * 3600);
        const fg = rng.next() < P_OWN_FEATURE ? g : rng.int(nGroups);
        const pickAt = ((w - demand.firstWeek) * nGroups + fg) * FEATURED_PER_GROUP + rng.int(FEATURED_PER_GROUP);
        const featured = demand.featured[pickAt]!;
        if (featured >= 0 && opened >= person.activeFromS && opened < endS && weekOf(opened) === w) {
          t = opened;
          anchor = featured;
          if (rng.next() < P_READ) {
            out.push(c, anchor, KIND.read, 1, t);
            t += 20 + rng.int(160);
          }
          out.push(c, anchor, KIND.click, 1, t);
          t += 3 + rng.int(8);
        }
      }
      if (anchor < 0) {
        const u = rng.next();
        if (seen > 0 && u < P_REVISIT) anchor = history[rng.int(Math.min(seen, HISTORY))]!;
        else if (u < P_REVISIT + P_GENERAL) anchor = drawPopular(demand, w, rng.next());
        else anchor = drawOwn(w);
        if (anchor < 0) continue;
      }
      out.push(c, anchor, KIND.view, 1, t);
      remember(anchor);
      funnel(anchor, t);
      if (items[anchor]!.group !== g) continue; // a stray look does not turn into browsing elsewhere
      for (let b = 0; b < MAX_BROWSE && rng.next() < P_BROWSE_ON; b++) {
        t += 20 + rng.int(220);
        w = weekOf(t);
        const next = drawOwn(w);
        if (next < 0) break;
        out.push(c, next, KIND.view, 1, t);
        remember(next);
        funnel(next, t);
      }
    }
  }
  return out;
}

/** Order of signals by time (ties keep generation order), so the file reads as a log. */
export function timeOrder(table: SignalTable): Uint32Array {
  const order = new Uint32Array(table.length);
  for (let k = 0; k < order.length; k++) order[k] = k;
  const at = table.at;
  return order.sort((a, b) => at[a]! - at[b]! || a - b);
}
