/**
 * The plan's rules as numbers the solvers read: slot counts, promoted bounds, quota groups, supplier floors and
 * caps, the sponsored cap per week, and which (shelf, week, candidate) may be chosen at all. Shares become slot
 * counts by the fill's one rounding (core/curation/share-counts.ts). The independent checker (check.ts) does not use this file.
 */
import { InputError } from '../errors.ts';
import { checkBrief } from '../curation/brief-check.ts';
import { quotaName } from '../curation/quota-counter.ts';
import { capOf, floorOf, promotedCountBounds } from '../curation/share-counts.ts';
import type { PlanInstance } from './types.ts';


/** "At most `max` of `members` on shelf `shelf` each week": one quota and one facet value. */
export interface QuotaGroup {
  shelf: number;
  name: string;
  value: string;
  max: number;
  members: Int32Array;
}

export interface CompiledPlan {
  P: number;
  N: number;
  S: number;
  sizes: Int32Array;
  totalSlots: number;
  promotedMin: Int32Array;
  promotedMax: Int32Array;
  groups: QuotaGroup[];
  /** Quota groups of candidate c on shelf s: groupIds[groupPtr[s·P + c] .. groupPtr[s·P + c + 1]). */
  groupPtr: Int32Array;
  groupIds: Int32Array;
  repeatAllowed: boolean;
  /** Supplier code (ctx) of each candidate; suppliers with a candidate, their floors and the cap. */
  supplier: Int32Array;
  supplierFloor: Map<number, number>;
  supplierCap: number;
  sponsoredCap: number;
  promoted: Uint8Array;
  /** 1 where (s, w, c) may be chosen: finite value, not banned, rested, and inside a lock's list when locked. */
  eligible: Uint8Array;
  /** 1 where (s, w, c) must be chosen: pins and locked lists. */
  forced: Uint8Array;
  lockedWeek: Uint8Array;
}

export const at = (c: CompiledPlan, s: number, w: number, p: number): number => (s * c.N + w) * c.P + p;

function fail(field: string, reason: string): never {
  throw new InputError(`${field}: ${reason}`, { column: field });
}

function checkShare(field: string, v: number): void {
  if (!(v >= 0 && v <= 1)) fail(field, `must be a share between 0 and 1, got ${v}`);
}

/** Checks the instance (bad input names its field) and compiles it. */
export function compilePlan(inst: PlanInstance): CompiledPlan {
  const { ctx, candidates, weeks: N, shelves, horizon: h, edits } = inst;
  const P = candidates.length;
  const S = shelves.length;
  if (!Number.isInteger(N) || N < 1 || N > 52) fail('weeks', `must be a whole number from 1 to 52, got ${N}`);
  if (S < 1) fail('shelves', 'name at least one shelf');
  if (inst.value.length !== S * N * P) fail('value', `holds ${inst.value.length} values, expected ${S} × ${N} × ${P}`);
  for (let k = 0; k < inst.value.length; k++) {
    const v = inst.value[k]!;
    if (!Number.isNaN(v) && !(v >= 0 && Number.isFinite(v))) fail('value', `must be >= 0 or NaN (not allowed), got ${v} at ${k}`);
  }
  shelves.forEach((sh, s) => {
    try {
      checkBrief({ size: sh.size, lambda: 1, rules: sh.rules, priceBand: {}, anchors: [], audience: { kind: 'everyone' }, include: { categories: [], tags: [], suppliers: [] }, exclude: { categories: [], tags: [], suppliers: [] }, weights: { content: 0, collaborative: 0, audience: 0, popularity: 0, trend: 0, freshness: 0 } });
    } catch (e) {
      if (e instanceof InputError) fail(`shelves[${s}].${e.where.column ?? 'rules'}`, e.message.replace(/^[^:]*: /, ''));
      throw e;
    }
  });
  if (!Number.isInteger(h.restWeeks) || h.restWeeks < 0) fail('horizon.restWeeks', `must be a whole number >= 0, got ${h.restWeeks}`);
  if (!Number.isInteger(h.maxAppearances) || h.maxAppearances < 1) fail('horizon.maxAppearances', `must be a whole number >= 1, got ${h.maxAppearances}`);
  checkShare('horizon.supplierMinShare', h.supplierMinShare);
  checkShare('horizon.supplierMaxShare', h.supplierMaxShare);
  checkShare('horizon.sponsoredMaxShare', h.sponsoredMaxShare);
  if (h.supplierMinShare > h.supplierMaxShare) fail('horizon.supplierMinShare', `is above supplierMaxShare (${h.supplierMinShare} > ${h.supplierMaxShare})`);
  const { minWeekWeight: beta, keepWeight } = inst.objective;
  if (!(beta >= 0 && beta <= 1)) fail('objective.minWeekWeight', `must be between 0 and 1, got ${beta}`);
  if (!(keepWeight >= 0 && Number.isFinite(keepWeight))) fail('objective.keepWeight', `must be >= 0, got ${keepWeight}`);

  const sizes = Int32Array.from(shelves, (s) => s.size);
  let perWeek = 0;
  for (const k of sizes) perWeek += k;
  const totalSlots = perWeek * N;
  const bounds = shelves.map((s) => promotedCountBounds(s.rules.promoted, s.size));
  const promotedMin = Int32Array.from(bounds, (b) => b.minCount);
  const promotedMax = Int32Array.from(bounds, (b) => b.maxCount);
  const promoted = Uint8Array.from(candidates, (i) => ctx.promoted[i]!);
  const supplier = Int32Array.from(candidates, (i) => ctx.supplier[i]!);

  // Quota groups: one per quota and facet value that some candidate carries.
  const groups: QuotaGroup[] = [];
  const memberOf: number[][] = Array.from({ length: S * P }, () => []);
  shelves.forEach((sh, s) => {
    for (const q of sh.rules.quotas) {
      const f = ctx.facets[q.facet];
      const byCode = new Map<number, number[]>();
      for (let p = 0; p < P; p++) {
        const i = candidates[p]!;
        const codes: number[] = [];
        if (q.facet === 'tag') for (let t = ctx.tagPtr[i]!; t < ctx.tagPtr[i + 1]!; t++) codes.push(ctx.tagCodes[t]!);
        else codes.push(q.facet === 'category' ? ctx.category[i]! : ctx.supplier[i]!);
        for (const c of codes) {
          if (q.value !== undefined && f.values[c] !== q.value) continue;
          let m = byCode.get(c);
          if (!m) byCode.set(c, (m = []));
          m.push(p);
        }
      }
      for (const [c, m] of byCode) {
        if (m.length <= q.max) continue; // cannot bind
        const g = groups.length;
        groups.push({ shelf: s, name: quotaName(q), value: f.values[c]!, max: q.max, members: Int32Array.from(m) });
        for (const p of m) memberOf[s * P + p]!.push(g);
      }
    }
  });
  const groupPtr = new Int32Array(S * P + 1);
  const ids: number[] = [];
  for (let k = 0; k < S * P; k++) {
    for (const g of memberOf[k]!) ids.push(g);
    groupPtr[k + 1] = ids.length;
  }

  const supplierFloor = new Map<number, number>();
  const minSlots = floorOf(h.supplierMinShare, totalSlots);
  if (minSlots > 0) for (const g of supplier) supplierFloor.set(g, minSlots);
  h.commitments.forEach((cm, k) => {
    if (!Number.isInteger(cm.minSlots) || cm.minSlots < 1) fail(`horizon.commitments[${k}].minSlots`, `must be a whole number >= 1, got ${cm.minSlots}`);
    const code = ctx.facets.supplier.code.get(cm.supplier);
    if (code === undefined) fail(`horizon.commitments[${k}].supplier`, `no supplier '${cm.supplier}' in the catalogue`);
    supplierFloor.set(code, Math.max(supplierFloor.get(code) ?? 0, cm.minSlots));
  });

  const eligible = new Uint8Array(S * N * P);
  const forced = new Uint8Array(S * N * P);
  const lockedWeek = new Uint8Array(S * N);
  const banned = new Uint8Array(P);
  for (const b of edits.bans) {
    if (!(b >= 0 && b < P)) fail('edits.bans', `candidate ${b} is not in the pool`);
    banned[b] = 1;
  }
  for (let s = 0; s < S; s++) {
    for (let w = 0; w < N; w++) {
      for (let p = 0; p < P; p++) {
        const k = (s * N + w) * P + p;
        if (!Number.isNaN(inst.value[k]!) && !banned[p] && w >= (inst.restUntil?.[p] ?? 0)) eligible[k] = 1;
      }
    }
  }
  const shelfWeek = (field: string, s: number, w: number) => {
    if (!(Number.isInteger(s) && s >= 0 && s < S)) fail(field, `shelf ${s} is not in the plan`);
    if (!(Number.isInteger(w) && w >= 0 && w < N)) fail(field, `week ${w + 1} is outside the ${N}-week horizon`);
  };
  edits.locks.forEach((l, k) => {
    shelfWeek(`edits.locks[${k}]`, l.shelf, l.week);
    if (l.items.length > sizes[l.shelf]!) fail(`edits.locks[${k}]`, `holds ${l.items.length} items for ${sizes[l.shelf]} slots`);
    lockedWeek[l.shelf * N + l.week] = 1;
    const base = (l.shelf * N + l.week) * P;
    // A locked week keeps its items even where a rule or a later ban would now refuse them: the editor froze it.
    eligible.fill(0, base, base + P);
    for (const p of l.items) {
      if (!(p >= 0 && p < P)) fail(`edits.locks[${k}]`, `candidate ${p} is not in the pool`);
      eligible[base + p] = 1;
      forced[base + p] = 1;
    }
  });
  edits.pins.forEach((pin, k) => {
    shelfWeek(`edits.pins[${k}]`, pin.shelf, pin.week);
    if (!(pin.candidate >= 0 && pin.candidate < P)) fail(`edits.pins[${k}]`, `candidate ${pin.candidate} is not in the pool`);
    const idx = (pin.shelf * N + pin.week) * P + pin.candidate;
    if (banned[pin.candidate]) fail(`edits.pins[${k}]`, 'the item is banned from the horizon; unban it before pinning it');
    if (lockedWeek[pin.shelf * N + pin.week] && !forced[idx]) fail(`edits.pins[${k}]`, `week ${pin.week + 1} is locked; unlock it before pinning`);
    // A pin is the editor's word: it runs even outside the brief's filters, as a pinned item does on a shelf.
    eligible[idx] = 1;
    forced[idx] = 1;
  });

  return {
    P,
    N,
    S,
    sizes,
    totalSlots,
    promotedMin,
    promotedMax,
    groups,
    groupPtr,
    groupIds: Int32Array.from(ids),
    repeatAllowed: shelves.every((s) => s.rules.allowRepeatInEdition),
    supplier,
    supplierFloor,
    supplierCap: capOf(h.supplierMaxShare, totalSlots),
    sponsoredCap: capOf(h.sponsoredMaxShare, perWeek),
    promoted,
    eligible,
    forced,
    lockedWeek,
  };
}
