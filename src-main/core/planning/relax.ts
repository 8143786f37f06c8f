/**
 * Infeasible rules: which rule families conflict, and the smallest relaxation that makes a plan exist.
 * Method: relax one rule family at a time by the least amount (binary search over that family's steps, each
 * step checked by re-solving the 0-1 program for feasibility only; feasibility only grows with the step, so
 * the search is exact) — "one family at a time, least step, re-solve". A family conflicts when relaxing it
 * alone restores feasibility. When none does alone, every family is relaxed to its loosest at once and the
 * answer says so. Pins and locks are the editor's word: they are relaxed last, as a family of their own.
 */
import { capOf, floorOf } from '../curation/share-counts.ts';
import { solveExact, type LpSolver } from './milp.ts';
import type { PlanInstance, RuleFamily } from './types.ts';

export interface Relaxation {
  family: RuleFamily;
  /** Steps relaxed: weeks, appearances, slots or quota places, as `description` says. */
  amount: number;
  description: string;
}

export interface Diagnosis {
  feasible: boolean;
  /** Families whose relaxation alone makes a plan exist, least amount first. */
  relaxations: Relaxation[];
  /** When no single family suffices: whether relaxing them all at their loosest does. */
  allTogether: boolean | null;
}

interface FamilyStep {
  family: RuleFamily;
  maxSteps: number;
  apply: (inst: PlanInstance, k: number) => PlanInstance;
  describe: (k: number) => string;
}

function families(inst: PlanInstance): FamilyStep[] {
  const h = inst.horizon;
  const N = inst.weeks;
  const perWeek = inst.shelves.reduce((a, s) => a + s.size, 0);
  const total = perWeek * N;
  const maxSize = Math.max(...inst.shelves.map((s) => s.size));
  const out: FamilyStep[] = [];
  const withHorizon = (x: PlanInstance, over: Partial<PlanInstance['horizon']>): PlanInstance => ({ ...x, horizon: { ...x.horizon, ...over } });
  if (h.restWeeks > 0) {
    out.push({ family: 'restWeeks', maxSteps: h.restWeeks, apply: (x, k) => withHorizon(x, { restWeeks: h.restWeeks - k }), describe: (k) => `rest period ${h.restWeeks} → ${h.restWeeks - k} weeks` });
  }
  if (h.maxAppearances < N) {
    out.push({ family: 'maxAppearances', maxSteps: N - h.maxAppearances, apply: (x, k) => withHorizon(x, { maxAppearances: h.maxAppearances + k }), describe: (k) => `at most ${h.maxAppearances} → ${h.maxAppearances + k} weeks per item` });
  }
  if (inst.shelves.some((s) => s.rules.quotas.length > 0)) {
    out.push({
      family: 'quotas',
      maxSteps: maxSize,
      apply: (x, k) => ({ ...x, shelves: x.shelves.map((s) => ({ ...s, rules: { ...s.rules, quotas: s.rules.quotas.map((q) => ({ ...q, max: q.max + k })) } })) }),
      describe: (k) => `every quota's limit raised by ${k}`,
    });
  }
  if (inst.shelves.some((s) => s.rules.promoted.minCount !== undefined || s.rules.promoted.maxCount !== undefined)) {
    out.push({
      family: 'promoted',
      maxSteps: maxSize,
      apply: (x, k) => ({
        ...x,
        shelves: x.shelves.map((s) => {
          const p = s.rules.promoted;
          const promoted = { ...p };
          if (p.minCount !== undefined) promoted.minCount = Math.max(0, (floorOf(p.minCount, s.size) - k) / s.size);
          if (p.maxCount !== undefined) promoted.maxCount = Math.min(1, (capOf(p.maxCount, s.size) + k) / s.size);
          return { ...s, rules: { ...s.rules, promoted } };
        }),
      }),
      describe: (k) => `each shelf's promoted floor lowered and cap raised by ${k} slot${k === 1 ? '' : 's'} a week`,
    });
  }
  if (inst.shelves.length > 1 && !inst.shelves.every((s) => s.rules.allowRepeatInEdition)) {
    out.push({
      family: 'repeatInEdition',
      maxSteps: 1,
      apply: (x) => ({ ...x, shelves: x.shelves.map((s) => ({ ...s, rules: { ...s.rules, allowRepeatInEdition: true } })) }),
      describe: () => 'allow an item on two shelves of one week',
    });
  }
  const minSlots = floorOf(h.supplierMinShare, total);
  if (minSlots > 0) {
    out.push({ family: 'supplierMinShare', maxSteps: minSlots, apply: (x, k) => withHorizon(x, { supplierMinShare: (minSlots - k) / total }), describe: (k) => `each supplier's floor ${minSlots} → ${minSlots - k} of ${total} slots` });
  }
  const cap = capOf(h.supplierMaxShare, total);
  if (cap < total) {
    out.push({ family: 'supplierMaxShare', maxSteps: total - cap, apply: (x, k) => withHorizon(x, { supplierMaxShare: (cap + k) / total }), describe: (k) => `a supplier's cap ${cap} → ${cap + k} of ${total} slots` });
  }
  if (h.commitments.length > 0) {
    const most = Math.max(...h.commitments.map((c) => c.minSlots));
    out.push({
      family: 'commitments',
      maxSteps: most,
      apply: (x, k) => withHorizon(x, { commitments: h.commitments.filter((c) => c.minSlots > k).map((c) => ({ ...c, minSlots: c.minSlots - k })) }),
      describe: (k) => `each supplier commitment lowered by ${k} slot${k === 1 ? '' : 's'}`,
    });
  }
  const spon = capOf(h.sponsoredMaxShare, perWeek);
  if (spon < perWeek) {
    out.push({ family: 'sponsoredMaxShare', maxSteps: perWeek - spon, apply: (x, k) => withHorizon(x, { sponsoredMaxShare: (spon + k) / perWeek }), describe: (k) => `sponsored cap ${spon} → ${spon + k} of ${perWeek} slots a week` });
  }
  if (inst.edits.pins.length > 0 || inst.edits.locks.length > 0) {
    out.push({ family: 'edits', maxSteps: 1, apply: (x) => ({ ...x, edits: { ...x.edits, pins: [], locks: [] } }), describe: () => 'drop the pins and unlock the locked weeks' });
  }
  return out;
}

export function diagnose(inst: PlanInstance, solver: LpSolver): Diagnosis {
  const feasible = (x: PlanInstance, allowEmpty = false) => solveExact(x, solver, { feasibilityOnly: true, allowEmpty }).status !== 'infeasible';
  if (feasible(inst)) return { feasible: true, relaxations: [], allTogether: null };
  const relaxations: Relaxation[] = [];
  const fams = families(inst);
  for (const f of fams) {
    if (!feasible(f.apply(inst, f.maxSteps))) continue;
    let lo = 0; // infeasible
    let hi = f.maxSteps; // feasible
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (feasible(f.apply(inst, mid))) hi = mid;
      else lo = mid;
    }
    relaxations.push({ family: f.family, amount: hi, description: f.describe(hi) });
  }
  // Empty slots: the fewest a plan needs, by maximising the filled slots (every value 1) with gaps allowed.
  const { previous: _previous, ...fresh } = inst;
  const ones: PlanInstance = { ...fresh, value: inst.value.map((v) => (Number.isNaN(v) ? v : 1)), objective: { minWeekWeight: 0, keepWeight: 0 } };
  const filled = solveExact(ones, solver, { allowEmpty: true });
  if (filled.plan) {
    const total = inst.shelves.reduce((a, s) => a + s.size, 0) * inst.weeks;
    let placed = 0;
    for (const weeks of filled.plan.slots) for (const list of weeks) for (const c of list) if (c >= 0) placed++;
    if (total - placed > 0) relaxations.push({ family: 'fill', amount: total - placed, description: `leave ${total - placed} slot${total - placed === 1 ? '' : 's'} empty` });
  }
  relaxations.sort((a, b) => a.amount - b.amount || a.family.localeCompare(b.family));
  let allTogether: boolean | null = null;
  if (relaxations.length === 0) {
    let x = inst;
    for (const f of fams) x = f.apply(x, f.maxSteps);
    allTogether = feasible(x);
  }
  return { feasible: false, relaxations, allTogether };
}
