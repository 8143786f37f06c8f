import { z } from 'zod';
import { RULE_FAMILIES } from '../../core/planning/types.ts';
import { method } from '../define.ts';

/**
 * The rotation planner (issue 14): plan or re-solve the weeks ahead for one or more shelves, show a stored
 * plan, list plans, make a draft edition from a planned week, and backtest on history. Items are named by
 * external id, weeks are 1-based; readings with no data (NaN in core) cross the boundary as null.
 */
const reading = z.number().nullable();
const label = (what: string) => z.string().trim().min(1, `name the ${what}`);
const share = z.number().min(0).max(1);

const HorizonInput = z
  .object({
    restWeeks: z.number().int().min(0).max(51),
    maxAppearances: z.number().int().min(1).max(52),
    supplierMinShare: share,
    supplierMaxShare: share,
    commitments: z.array(z.object({ supplier: label('supplier'), minSlots: z.number().int().min(1) }).strict()),
    sponsoredMaxShare: share,
  })
  .partial()
  .strict();

const ObjectiveInput = z
  .object({
    /** β in (1 − β)·mean week + β·weakest week. */
    minWeekWeight: share,
    /** Value per placement kept from the stored plan on a re-solve. */
    keepWeight: z.number().min(0).max(1000),
  })
  .partial()
  .strict();

const Template = {
  shelf: label('shelf'),
  edition: label('edition').optional(),
  shelves: z.array(label('shelf')).optional(),
  horizon: HorizonInput.optional(),
  objective: ObjectiveInput.optional(),
};

export const PlanRequest = z
  .object({
    name: label('plan').optional(),
    ...Template,
    start: z.string().trim().optional(),
    weeks: z.number().int().min(1).max(52).optional(),
    pins: z.array(z.object({ item: label('item'), week: z.number().int().min(1), shelf: label('shelf').optional() }).strict()).optional(),
    bans: z.array(label('item')).optional(),
    locks: z.array(z.object({ week: z.number().int().min(1), shelf: label('shelf').optional() }).strict()).optional(),
    clearEdits: z.boolean().optional(),
    method: z.enum(['auto', 'exact', 'heuristic']).optional(),
  })
  .strict();

const WeekMeter = z.object({ distinctItems: z.number().int(), supplierGini: reading, relevance: reading, seasonalFit: reading, value: reading });
const ForecastErrorView = z.object({ method: z.string(), baseline: z.string(), heldOutWeeks: z.number().int(), series: z.number().int(), mase: reading, baselineMase: reading });

export const PlanView = z.object({
  name: z.string(),
  edition: z.string(),
  shelves: z.array(z.string()),
  start: z.string(),
  method: z.enum(['exact', 'heuristic']),
  status: z.enum(['optimal', 'feasible', 'timeLimit', 'infeasible']),
  objective: reading,
  variables: z.number().int(),
  candidates: z.number().int(),
  pool: z.number().int(),
  ms: z.number(),
  changed: z.number().int().nullable(),
  weeks: z.array(
    z.object({
      week: z.number().int(),
      date: z.string(),
      locked: z.array(z.string()),
      shelves: z.array(
        z.object({
          label: z.string(),
          slots: z.array(
            z.object({
              slot: z.number().int(),
              item: z.string().nullable(),
              title: z.string().nullable(),
              category: z.string().nullable(),
              supplier: z.string().nullable(),
              promoted: z.boolean(),
              relevance: reading,
              fit: reading,
              value: reading,
              pinned: z.boolean(),
            }),
          ),
        }),
      ),
      meter: WeekMeter,
    }),
  ),
  horizon: WeekMeter.extend({ weakestWeekValue: reading }).nullable(),
  forecast: z.object({ method: z.string(), baseline: z.string(), heldOutWeeks: z.number().int(), categories: ForecastErrorView, items: ForecastErrorView }).nullable(),
  diagnosis: z
    .object({
      relaxations: z.array(z.object({ family: z.enum(RULE_FAMILIES), amount: z.number().int(), description: z.string() })),
      allTogether: z.boolean().nullable(),
    })
    .nullable(),
  edits: z.object({
    pins: z.array(z.object({ item: z.string(), week: z.number().int(), shelf: z.string() })),
    bans: z.array(z.string()),
    locks: z.array(z.object({ week: z.number().int(), shelf: z.string() })),
  }),
  drafts: z.array(z.object({ week: z.number().int(), edition: z.string() })),
  notes: z.array(z.string()),
});

export const PlanBacktestView = z.object({
  weeks: z.array(z.object({ week: z.number().int(), date: z.string(), active: z.number().int(), plan: z.number().int(), popularity: z.number().int(), withoutSeason: z.number().int() })),
  share: z.object({ plan: reading, popularity: reading, withoutSeason: reading }),
  method: z.string(),
  notes: z.array(z.string()),
});

export const planningMethods = {
  'plan.solve': method({
    summary: 'Plan (or re-solve, changing as little as it can) the next weeks of one or more shelves under the briefs\' rules and the horizon rules; pins, bans and locks are kept with the plan.',
    request: PlanRequest,
    response: PlanView,
  }),
  'plan.show': method({
    summary: 'A stored plan with its meter per week and for the horizon, solving nothing.',
    request: z.object({ name: label('plan') }).strict(),
    response: PlanView,
  }),
  'plan.list': method({
    summary: 'The stored plans.',
    request: z.object({}).strict(),
    response: z.array(z.object({ name: z.string(), edition: z.string(), shelves: z.array(z.string()), start: z.string(), weeks: z.number().int(), method: z.string(), status: z.string() })),
  }),
  'plan.draft': method({
    summary: 'Turn a planned week into a draft edition (the template\'s shelves, the planned items pinned).',
    request: z.object({ name: label('plan'), week: z.number().int().min(1), label: label('edition').optional() }).strict(),
    response: z.object({ edition: z.string(), date: z.string(), shelves: z.array(z.object({ label: z.string(), items: z.array(z.string().nullable()) })) }),
  }),
  'plan.backtest': method({
    summary: 'Replay the last N weeks of history with the planner against a popularity plan: the share of the shelves\' active audience who engaged with planned items.',
    request: z.object({ ...Template, weeks: z.number().int().min(1).max(52).default(6) }).strict(),
    response: PlanBacktestView,
  }),
};
