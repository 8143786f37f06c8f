import type { StateCreator } from 'zustand';
import type { RequestOf, ResponseOf } from '../../src-main/api/contract.ts';
import { describeError, type Client } from '../client/client.ts';
import type { AppState } from './store.ts';

export type PlanView = ResponseOf<'plan.solve'>;
type PlanRequest = RequestOf<'plan.solve'>;

/** The rotation planner's screen state: the plan shown, what the last action said, and its error. */
export interface PlannerSlice {
  planner: { plan: PlanView | null; busy: boolean; error: string | null; message: string | null };
  /** Plans (or re-plans under the same name) from the form. */
  makePlan(req: Pick<PlanRequest, 'name' | 'shelf' | 'shelves' | 'edition' | 'start' | 'weeks' | 'horizon'>): Promise<boolean>;
  /** Keeps the item in that week (1-based) on that shelf, and re-solves. */
  pinInPlan(item: string, week: number, shelf: string): Promise<boolean>;
  /** Keeps the week's items on that shelf as they are, and re-solves the rest. */
  lockPlanWeek(week: number, shelf: string): Promise<boolean>;
  banFromPlan(item: string): Promise<boolean>;
  /** Solves again with the stored edits (after new signals or a new model), changing as little as it can. */
  resolvePlan(): Promise<boolean>;
  /** Turns the planned week into a draft edition (planned items pinned). */
  draftPlanWeek(week: number): Promise<boolean>;
}

export function createPlannerSlice(client: Client): StateCreator<AppState, [], [], PlannerSlice> {
  return (set, get) => {
    const run = async (call: () => Promise<{ plan?: PlanView; message: string | null }>): Promise<boolean> => {
      set((s) => ({ planner: { ...s.planner, busy: true, error: null } }));
      try {
        const r = await call();
        set((s) => ({ planner: { ...s.planner, busy: false, ...(r.plan && { plan: r.plan }), message: r.message } }));
        return true;
      } catch (e) {
        set((s) => ({ planner: { ...s.planner, busy: false, error: describeError(e) } }));
        return false;
      }
    };
    /** Re-solves with one more edit; the message says which edit, so two re-solves in a row read differently. */
    const again = (extra: Partial<PlanRequest>, did: string | null, after: (plan: PlanView) => string = () => '') =>
      run(async () => {
        const p = get().planner.plan;
        if (!p) throw new Error('Make a plan first.');
        const plan = await client.call('plan.solve', { name: p.name, shelf: p.shelves[0]!, edition: p.edition, ...extra });
        const changed = plan.changed === null ? null : `${plan.changed} placement${plan.changed === 1 ? '' : 's'} changed.`;
        const said = changed === null ? did : did === null ? `Re-solved: ${changed}` : `${did} and re-solved: ${changed}`;
        return { plan, message: `${said ?? ''}${after(plan)}` || null };
      });
    /** A lock keeps its week as it was, ban or not: say so when a banned item stays in a locked week. */
    const stillIn = (item: string) => (plan: PlanView) => {
      const where = plan.weeks.flatMap((w) => w.shelves.filter((sh) => sh.slots.some((x) => x.item === item)).map((sh) => `week ${w.week} of ${sh.label}`));
      return where.length === 0 ? '' : ` It stays in locked ${where.join(', ')}: a locked week keeps its items.`;
    };
    return {
      planner: { plan: null, busy: false, error: null, message: null },
      makePlan: (req) => run(async () => ({ plan: await client.call('plan.solve', req), message: null })),
      pinInPlan: (item, week, shelf) => again({ pins: [{ item, week, shelf }] }, `Pinned ${item} to week ${week} of ${shelf}`),
      lockPlanWeek: (week, shelf) => again({ locks: [{ week, shelf }] }, `Locked week ${week} of ${shelf}`),
      banFromPlan: (item) => again({ bans: [item] }, `Banned ${item} from the plan`, stillIn(item)),
      resolvePlan: () => again({}, null),
      draftPlanWeek: (week) =>
        run(async () => {
          const p = get().planner.plan;
          if (!p) throw new Error('Make a plan first.');
          const d = await client.call('plan.draft', { name: p.name, week });
          await get().loadEditions();
          return { plan: { ...p, drafts: [...p.drafts.filter((x) => x.week !== week), { week, edition: d.edition }] }, message: `Draft edition “${d.edition}” made from week ${week}.` };
        }),
    };
  };
}
