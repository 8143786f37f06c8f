/**
 * Backtest (DESIGN.md): how a finished shelf would have done on the most recent interactions. Of the
 * shelf's audience who were active in the held-out window [end − w, end) (end = just after the latest
 * signal, w = 28 days by default), the share who engaged with at least one of the shelf's items — beside
 * the same share for a popularity-only list of the same size and filters, ranked by distinct customers in
 * the window of the same length just before (a "most popular" baseline, the usual floor a recommender
 * must beat; common practice, no source). Rule audiences are resolved at the window's start, so the
 * window's own signals do not choose who is counted.
 */
import { buildCandidatePool } from '../../core/curation/candidates.ts';
import { resolveAudience } from '../../core/scoring/index.ts';
import { InputError } from '../../core/errors.ts';
import { DAY_MS } from '../../core/types.ts';
import type { Shelf, SlotRow } from '../../store/shelves.ts';
import type { CurationWorld } from './world.ts';

export interface BacktestResult {
  windowDays: number;
  windowStart: string;
  windowEnd: string;
  audienceActive: number;
  shelf: { engaged: number; share: number | null; items: string[] };
  popularity: { engaged: number; share: number | null; items: string[] };
  notes: string[];
}

/** Active audience members, and how many of them touched any of `items` (dense) in [from, to). */
function engagement(world: CurationWorld, member: Uint8Array, items: Int32Array, from: number, to: number): { active: number; engaged: number } {
  const { ds } = world;
  const onList = new Uint8Array(ds.items.length);
  for (const i of items) onList[i] = 1;
  const active = new Uint8Array(ds.customerIds.length);
  const engaged = new Uint8Array(ds.customerIds.length);
  const s = ds.signals;
  for (let k = 0; k < s.length; k++) {
    const t = s.at[k]!;
    if (!(t >= from && t < to)) continue;
    const u = s.customer[k]!;
    if (!member[u]) continue;
    active[u] = 1;
    if (onList[s.item[k]!]) engaged[u] = 1;
  }
  let a = 0;
  let e = 0;
  for (let u = 0; u < active.length; u++) {
    a += active[u]!;
    e += engaged[u]!;
  }
  return { active: a, engaged: e };
}

export function backtestShelf(world: CurationWorld, shelf: Shelf, slots: readonly SlotRow[], windowDays = 28): BacktestResult {
  const { ds, ctx } = world;
  const s = ds.signals;
  let latest = -Infinity;
  let untimed = 0;
  for (let k = 0; k < s.length; k++) {
    const t = s.at[k]!;
    if (t > latest) latest = t;
    else if (t !== t) untimed++;
  }
  const notes: string[] = [];
  // A backtest replays the latest weeks: signals without a time belong to no week. A workspace with none (a
  // shop's export of counts) has nothing to replay, which is said as such rather than as an empty window at 1970.
  if (!Number.isFinite(latest)) {
    throw new InputError(
      s.length === 0
        ? 'a backtest replays the latest signals, and the workspace has none yet'
        : `a backtest replays the latest weeks of signals, and none of the ${s.length.toLocaleString('en')} signals has a time; evaluate the models instead (a per-customer split needs no times)`,
    );
  }
  if (untimed > 0) notes.push(`${untimed.toLocaleString('en')} signals without a time belong to no window and are left out`);
  const end = latest + 1;
  const start = end - windowDays * DAY_MS;
  const before = start - windowDays * DAY_MS;

  const audience = resolveAudience(ds, shelf.brief.audience, start, world.groups, world.groupNames);
  const member = new Uint8Array(ds.customerIds.length);
  for (const u of audience) member[u] = 1;

  const shelfItems = Int32Array.from(
    slots.map((x) => (x.itemId === null ? -1 : (ctx.indexOfId.get(x.itemId) ?? -1))).filter((i) => i >= 0),
  );

  // The baseline: same filters (no editorial state), ranked by distinct customers in the window before.
  const pool = buildCandidatePool(
    ctx,
    shelf.brief,
    { bans: new Set(), banRules: [], resting: new Set(), usedInEdition: new Set(), pins: new Map() },
    start,
  ).items;
  const nC = ds.customerIds.length;
  const seen = new Set<number>();
  const count = new Int32Array(ds.items.length);
  for (let k = 0; k < s.length; k++) {
    const t = s.at[k]!;
    if (!(t >= before && t < start)) continue;
    const key = s.item[k]! * nC + s.customer[k]!;
    if (seen.has(key)) continue;
    seen.add(key);
    count[s.item[k]!]!++;
  }
  const ranked = Int32Array.from(pool).sort((a, b) => count[b]! - count[a]! || a - b);
  const popItems = ranked.subarray(0, shelf.size);

  const mine = engagement(world, member, shelfItems, start, end);
  const pop = engagement(world, member, popItems, start, end);
  if (mine.active === 0) notes.push('no one in the audience was active in the window: nothing to measure');
  notes.push(
    'the shelf was filled with models and popularity that saw the window\'s signals unless trained before it, so its share may read high',
  );
  const ext = (i: number) => ds.items[i]!.externalId;
  const iso = (t: number) => new Date(t).toISOString().slice(0, 10);
  return {
    windowDays,
    windowStart: iso(start),
    windowEnd: iso(latest),
    audienceActive: mine.active,
    shelf: { engaged: mine.engaged, share: mine.active === 0 ? null : mine.engaged / mine.active, items: Array.from(shelfItems, ext) },
    popularity: { engaged: pop.engaged, share: pop.active === 0 ? null : pop.engaged / pop.active, items: Array.from(popItems, ext) },
    notes,
  };
}
