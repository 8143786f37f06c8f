/**
 * An independent check of a plan against every rule, written from the rules' words and sharing no code
 * with the solvers (compile.ts, milp.ts, heuristic.ts): the tests run every solver's plan through it.
 * Quotas reuse the shelf fill's own counter (core/curation/quota-counter.ts), so a planned week breaks a
 * quota exactly when a shelf filled with it would. Returns every broken rule in words; [] = the plan holds.
 */
import { QuotaCounter } from '../curation/quota-counter.ts';
import type { Plan, PlanInstance, PlanViolation } from './types.ts';

export function checkPlan(inst: PlanInstance, plan: Plan, options: { allowEmpty?: boolean } = {}): PlanViolation[] {
  const out: PlanViolation[] = [];
  const { ctx, candidates, weeks: N, shelves, horizon: h, edits } = inst;
  const P = candidates.length;
  const add = (rule: string, reason: string) => out.push({ rule, reason });
  const name = (c: number) => ctx.externalIds[candidates[c]!] ?? `#${c}`;
  const banned = new Set(edits.bans);
  const locked = new Map(edits.locks.map((l) => [`${l.shelf}:${l.week}`, l.items]));
  // weeksOf[c] = sorted weeks in which candidate c runs on any shelf.
  const weeksOf: Set<number>[] = Array.from({ length: P }, () => new Set());
  const perSupplier = new Map<number, number>();
  if (plan.slots.length !== shelves.length) add('shape', `the plan has ${plan.slots.length} shelves, expected ${shelves.length}`);
  for (let w = 0; w < N; w++) {
    const seenThisWeek = new Map<number, number>();
    let weekSlots = 0;
    let weekPromoted = 0;
    shelves.forEach((shelf, s) => {
      const list = plan.slots[s]?.[w];
      if (!list || list.length !== shelf.size) {
        add('shape', `${shelf.label} week ${w + 1} has ${list?.length ?? 0} slots, expected ${shelf.size}`);
        return;
      }
      weekSlots += shelf.size;
      const quotas = new QuotaCounter(ctx, shelf.rules.quotas);
      const here = new Set<number>();
      let promoted = 0;
      let empty = 0;
      const lock = locked.get(`${s}:${w}`);
      for (const c of list) {
        if (c < 0) {
          empty++;
          continue;
        }
        if (here.has(c)) add('duplicate', `${name(c)} is twice on ${shelf.label} in week ${w + 1}`);
        here.add(c);
        const pinned = edits.pins.some((p) => p.candidate === c && p.shelf === s && p.week === w);
        const frozen = lock?.includes(c) ?? false;
        if (!pinned && !frozen) {
          if (Number.isNaN(inst.value[(s * N + w) * P + c]!)) add('eligible', `${name(c)} may not run on ${shelf.label} in week ${w + 1}`);
          if (banned.has(c)) add('ban', `${name(c)} is banned from the horizon but runs in week ${w + 1}`);
          if (w < (inst.restUntil?.[c] ?? 0)) add('restWeeks', `${name(c)} is still resting from a published edition in week ${w + 1}`);
        }
        quotas.add(candidates[c]!);
        if (ctx.promoted[candidates[c]!] === 1) promoted++;
        seenThisWeek.set(c, (seenThisWeek.get(c) ?? 0) + 1);
        weeksOf[c]!.add(w);
        const sup = ctx.supplier[candidates[c]!]!;
        perSupplier.set(sup, (perSupplier.get(sup) ?? 0) + 1);
      }
      weekPromoted += promoted;
      if (empty > 0 && !options.allowEmpty && !lock) add('fill', `${shelf.label} week ${w + 1} has ${empty} empty slots`);
      for (const o of quotas.over()) add('quotas', `${shelf.label} week ${w + 1}: ${o.name} broken by ${o.value} (${o.count})`);
      const pr = shelf.rules.promoted;
      // Shares of the shelf's slots, compared with a 1e-9 allowance for 0.1 × 30 in floating point.
      if (pr.maxCount !== undefined && promoted > pr.maxCount * shelf.size + 1e-9) add('promoted', `${shelf.label} week ${w + 1}: ${promoted} promoted items, above ${pr.maxCount} of ${shelf.size}`);
      if (pr.minCount !== undefined && promoted < pr.minCount * shelf.size - 1e-9) add('promoted', `${shelf.label} week ${w + 1}: ${promoted} promoted items, below ${pr.minCount} of ${shelf.size}`);
      if (lock) for (const c of lock) if (!here.has(c)) add('edits', `${shelf.label} week ${w + 1} is locked but lost ${name(c)}`);
      if (lock && here.size !== lock.length) add('edits', `${shelf.label} week ${w + 1} is locked but holds other items`);
    });
    if (!shelves.every((s) => s.rules.allowRepeatInEdition)) {
      for (const [c, k] of seenThisWeek) if (k > 1) add('repeatInEdition', `${name(c)} runs on ${k} shelves in week ${w + 1}`);
    }
    if (weekPromoted > h.sponsoredMaxShare * weekSlots + 1e-9) add('sponsoredMaxShare', `week ${w + 1}: ${weekPromoted} of ${weekSlots} slots are sponsored, above ${h.sponsoredMaxShare}`);
  }
  for (let c = 0; c < P; c++) {
    const ws = [...weeksOf[c]!].sort((a, b) => a - b);
    if (ws.length > h.maxAppearances) add('maxAppearances', `${name(c)} runs in ${ws.length} weeks, above ${h.maxAppearances}`);
    for (let k = 1; k < ws.length; k++) {
      if (ws[k]! - ws[k - 1]! <= h.restWeeks) add('restWeeks', `${name(c)} runs in weeks ${ws[k - 1]! + 1} and ${ws[k]! + 1}, closer than ${h.restWeeks} weeks of rest`);
    }
  }
  const all = new Set<number>();
  for (const i of candidates) all.add(ctx.supplier[i]!);
  for (const sup of all) {
    const n = perSupplier.get(sup) ?? 0;
    const label = ctx.facets.supplier.values[sup];
    const slots = N * shelves.reduce((a, s) => a + s.size, 0);
    if (n < h.supplierMinShare * slots - 1e-9) add('supplierMinShare', `${label} has ${n} of ${slots} slots, below ${h.supplierMinShare}`);
    if (n > h.supplierMaxShare * slots + 1e-9) add('supplierMaxShare', `${label} has ${n} of ${slots} slots, above ${h.supplierMaxShare}`);
  }
  for (const cm of h.commitments) {
    const code = ctx.facets.supplier.code.get(cm.supplier);
    const n = code === undefined ? 0 : (perSupplier.get(code) ?? 0);
    if (n < cm.minSlots) add('commitments', `${cm.supplier} has ${n} slots, below the ${cm.minSlots} promised`);
  }
  for (const pin of edits.pins) {
    if (!plan.slots[pin.shelf]?.[pin.week]?.includes(pin.candidate)) add('edits', `${name(pin.candidate)} is pinned to week ${pin.week + 1} but not there`);
  }
  return out;
}
