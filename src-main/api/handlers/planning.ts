import { curationModelSource } from '../../services/curation/model-source.ts';
import type { AppContext } from '../../services/context.ts';
import { PlanService } from '../../services/planning/service.ts';
import type { ResponseOf } from '../contract.ts';
import type { Handler } from '../handler-table.ts';
import { finite } from './curation.ts';

type Names = 'plan.solve' | 'plan.show' | 'plan.list' | 'plan.draft' | 'plan.backtest';

/** Drops keys whose value is undefined (the service's options are exact: absent, not undefined). */
function defined<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}

export function planningHandlers(ctx: AppContext): { [M in Names]: Handler<M> } {
  const svc = () => new PlanService(ctx.db, curationModelSource);
  return {
    'plan.solve': async (r) => finite(await svc().plan(defined({ ...r, horizon: r.horizon && defined(r.horizon), objective: r.objective && defined(r.objective) }) as Parameters<PlanService['plan']>[0])) as unknown as ResponseOf<'plan.solve'>,
    'plan.show': (r) => finite(svc().show(r.name)) as unknown as ResponseOf<'plan.show'>,
    'plan.list': () => svc().list().map((p) => ({ name: p.name, edition: p.edition, shelves: p.shelves, start: p.start, weeks: p.weeks, method: p.method, status: p.status })),
    'plan.draft': (r) => {
      const e = svc().draft(r.name, r.week, r.label);
      return { edition: e.label, date: e.date, shelves: e.shelves.map((s) => ({ label: s.label, items: s.slots.map((x) => x.item) })) };
    },
    'plan.backtest': async (r) =>
      finite(await svc().backtest(defined({ ...r, horizon: r.horizon && defined(r.horizon), objective: r.objective && defined(r.objective) }) as Parameters<PlanService['backtest']>[0])) as unknown as ResponseOf<'plan.backtest'>,
  };
}
