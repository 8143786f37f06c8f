/**
 * The rotation planner's model (issue 14): N weeks × S shelves × K slots chosen from a candidate pool, with a
 * predicted value per (shelf, week, item) = the shelf's validated relevance × the item's seasonal fit that week.
 * A plan is a set of items per shelf-week; the order inside a week is by value (the fill orders a draft).
 */
import type { CurationContext } from '../curation/context.ts';
import type { Rules } from '../curation/types.ts';

/** One shelf of the plan: its size and the brief's rules, which hold in every planned week. */
export interface PlanShelf {
  label: string;
  size: number;
  rules: Rules;
}

/** A supplier's promised slots over the horizon ("supplier S gets at least 3 slots over these 6 weeks"). */
export interface Commitment {
  supplier: string;
  minSlots: number;
}

/** Rules over the whole horizon, on top of each brief's rules per week. */
export interface HorizonRules {
  /** Weeks that must pass between two appearances of an item (an item in week w may run again in w + rest + 1). */
  restWeeks: number;
  /** At most this many weeks with the item in the horizon. */
  maxAppearances: number;
  /** Every supplier with a candidate gets at least this share of the horizon's slots (0 = off). */
  supplierMinShare: number;
  /** No supplier takes more than this share of the horizon's slots (1 = off). */
  supplierMaxShare: number;
  commitments: Commitment[];
  /** Promoted (sponsored) items take at most this share of each week's slots over all shelves (1 = off). */
  sponsoredMaxShare: number;
}

/** Editor's fixes: candidates are indices into `PlanInstance.candidates`; weeks and shelves 0-based. */
export interface PlanEdits {
  pins: { candidate: number; shelf: number; week: number }[];
  /** Candidates kept out of the whole horizon. */
  bans: number[];
  /** A locked shelf-week keeps exactly these candidates. */
  locks: { shelf: number; week: number; items: number[] }[];
}

export interface PlanObjective {
  /**
   * β in objective = (1 − β) · mean_w V_w + β · min_w V_w, V_w = the week's predicted value over all shelves.
   * The sum alone lets the solver spend the best items where their seasonal peak is and leave a week weak;
   * the minimum alone ignores every week but the weakest (many plans tie); a blend keeps both.
   */
  minWeekWeight: number;
  /** Value per placement kept from `previous` (re-solving changes as little as it can). */
  keepWeight: number;
}

export interface PlanInstance {
  ctx: CurationContext;
  /** Dense catalogue item of each candidate; candidate c's facets are read at ctx[candidates[c]]. */
  candidates: Int32Array;
  weeks: number;
  shelves: PlanShelf[];
  /** value[(s · weeks + w) · P + c] ≥ 0, NaN where candidate c may not run on shelf s in week w. */
  value: Float64Array;
  horizon: HorizonRules;
  edits: PlanEdits;
  objective: PlanObjective;
  /** First week each candidate may run (items resting after published editions); absent = 0. */
  restUntil?: Int32Array;
  /** The plan being re-solved: placements kept earn `keepWeight`. */
  previous?: Plan;
}

/** slots[s][w] = candidates of shelf s in week w, best value first; -1 = an empty slot. */
export interface Plan {
  slots: Int32Array[][];
}

export interface PlanViolation {
  rule: string;
  reason: string;
}

/** The rule families an infeasible plan can relax, one at a time (relax.ts). */
export const RULE_FAMILIES = [
  'fill',
  'restWeeks',
  'maxAppearances',
  'quotas',
  'promoted',
  'repeatInEdition',
  'supplierMinShare',
  'supplierMaxShare',
  'commitments',
  'sponsoredMaxShare',
  'edits',
] as const;
export type RuleFamily = (typeof RULE_FAMILIES)[number];

export interface SolveReport {
  plan: Plan | null;
  method: 'exact' | 'heuristic';
  status: 'optimal' | 'feasible' | 'timeLimit' | 'infeasible';
  objective: number;
  ms: number;
}
