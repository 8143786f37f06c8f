/**
 * The rotation planner's use cases: plan (create or re-solve, with pins, bans and locks), show, make a draft
 * edition from a planned week, and backtest. Loads once, runs the pure core, writes in one transaction.
 * A re-solve keeps the stored plan wherever it costs little: every kept placement earns `keepWeight`
 * (objective.ts), so a pin or ban changes the weeks it must and few others.
 */
import { InputError, NotFoundError } from '../../core/errors.ts';
import { keptCount, scorePlan } from '../../core/planning/objective.ts';
import { meterPlan } from '../../core/planning/meter.ts';
import type { HorizonRules, PlanObjective, SolveReport } from '../../core/planning/types.ts';
import { checkDate, dateMs } from '../../store/editions.ts';
import { RotationPlanRepo, type PlanEditRow, type StoredPlan } from '../../store/rotation-plans.ts';
import type { Shelf } from '../../store/shelves.ts';
import type { Db } from '../../store/workspace.ts';
import { curationRepos } from '../curation/repos.ts';
import { CurationService } from '../curation/service.ts';
import type { EditionView } from '../curation/views.ts';
import { noModels, type ModelSource } from '../curation/world.ts';
import { backtestPlan, type PlanBacktest } from './backtest.ts';
import { buildPlan, type PlanSetup } from './build.ts';
import { solvePlan, type SolveMethod } from './solve.ts';
import { planView, type PlanView } from './views.ts';

export interface PlanRequest {
  name?: string;
  /** The template: a shelf label, the edition holding it (default: the newest edition with that shelf). */
  shelf: string;
  edition?: string;
  /** More shelves of the same edition planned together. */
  shelves?: string[];
  start?: string;
  weeks?: number;
  horizon?: Partial<HorizonRules>;
  objective?: Partial<PlanObjective>;
  /** Items by external id, weeks 1-based, shelves by label (default: the template shelf). */
  pins?: { item: string; week: number; shelf?: string }[];
  bans?: string[];
  locks?: { week: number; shelf?: string }[];
  /** Drop the stored pins, bans and locks before adding these. */
  clearEdits?: boolean;
  method?: SolveMethod;
}

export const DEFAULT_OBJECTIVE: PlanObjective = { minWeekWeight: 0.3, keepWeight: 0.02 };

export class PlanService {
  readonly db: Db;
  readonly curation: CurationService;
  readonly plans: RotationPlanRepo;
  readonly #now: () => number;

  constructor(db: Db, source: ModelSource = noModels, clock: () => number = Date.now, now: () => number = () => performance.now()) {
    this.db = db;
    this.curation = new CurationService(db, source, clock);
    this.plans = new RotationPlanRepo(db);
    this.#now = now;
  }

  #template(shelf: string, edition: string | undefined): { edition: string; shelf: Shelf } {
    const { editions, shelves } = curationRepos(this.db);
    if (edition !== undefined) {
      const e = editions.byLabel(edition);
      return { edition: e.label, shelf: shelves.byLabel(e.id, shelf) };
    }
    const all = editions.list().slice().sort((a, b) => (a.date < b.date ? 1 : a.date > b.date ? -1 : b.id - a.id));
    for (const e of all) {
      const s = shelves.list(e.id).find((x) => x.label === shelf);
      if (s) return { edition: e.label, shelf: s };
    }
    throw new NotFoundError(`no edition has a shelf labelled '${shelf}'`);
  }

  #itemId(ext: string, field: string): number {
    const it = this.curation.items.byExternalId(ext);
    if (!it) throw new InputError(`${field}: no item with id '${ext}'`, { column: field });
    return it.id;
  }

  #setup(req: PlanRequest) {
    const stored = req.name !== undefined ? this.plans.find(req.name) : undefined;
    const { edition, shelf } = this.#template(req.shelf, req.edition ?? stored?.edition);
    const e = curationRepos(this.db).editions.byLabel(edition);
    const labels = [shelf.label, ...(req.shelves ?? stored?.shelves.slice(1) ?? []).filter((l) => l !== shelf.label)];
    const shelves = labels.map((l) => curationRepos(this.db).shelves.byLabel(e.id, l));
    const start = req.start ?? stored?.start;
    if (start === undefined) throw new InputError('from: give the date of the first planned week (YYYY-MM-DD)', { column: 'from' });
    checkDate(start, 'from');
    const weeks = req.weeks ?? stored?.weeks ?? 6;
    if (!Number.isInteger(weeks) || weeks < 1 || weeks > 52) throw new InputError(`weeks: must be a whole number from 1 to 52, got ${weeks}`, { column: 'weeks' });
    const rest = Math.max(...shelves.map((s) => s.brief.rules.restPeriod));
    const horizon: HorizonRules = {
      restWeeks: rest,
      maxAppearances: Math.max(1, Math.ceil(weeks / 3)),
      supplierMinShare: 0,
      supplierMaxShare: 1,
      commitments: [],
      sponsoredMaxShare: 1,
      ...(stored?.horizon as Partial<HorizonRules> | undefined),
      ...req.horizon,
    };
    const objective: PlanObjective = { ...DEFAULT_OBJECTIVE, ...(stored?.objective as Partial<PlanObjective> | undefined), ...req.objective };
    const name = req.name ?? `${labels.join(' + ')} from ${start}`;
    const again = stored ?? this.plans.find(name);
    const shelfIndex = (l: string | undefined, field: string) => {
      if (l === undefined) return 0;
      const k = labels.indexOf(l);
      if (k < 0) throw new InputError(`${field}: the plan has no shelf '${l}' (it plans ${labels.map((x) => `'${x}'`).join(', ')})`, { column: field });
      return k;
    };
    const week = (w: number, field: string) => {
      if (!Number.isInteger(w) || w < 1 || w > weeks) throw new InputError(`${field}: week ${w} is outside the ${weeks}-week plan`, { column: field });
      return w - 1;
    };
    let edits: PlanEditRow[] = again && !req.clearEdits ? this.plans.edits(again.id) : [];
    for (const p of req.pins ?? []) edits.push({ kind: 'pin', itemId: this.#itemId(p.item, 'pin'), week: week(p.week, 'pin'), shelf: shelfIndex(p.shelf, 'pin') });
    for (const b of req.bans ?? []) edits.push({ kind: 'ban', itemId: this.#itemId(b, 'ban') });
    for (const l of req.locks ?? []) {
      if (!again) throw new InputError('lock: there is no stored plan to lock a week of; plan first', { column: 'lock' });
      edits.push({ kind: 'lock', week: week(l.week, 'lock'), shelf: shelfIndex(l.shelf, 'lock') });
    }
    edits = dedupe(edits);
    const previous = again ? this.#stored(again) : undefined;
    const setup: PlanSetup = {
      shelves,
      start,
      weeks,
      horizon,
      objective,
      pins: edits.flatMap((x) => (x.kind === 'pin' ? [{ itemId: x.itemId, shelf: x.shelf, week: x.week }] : [])),
      bans: edits.flatMap((x) => (x.kind === 'ban' ? [x.itemId] : [])),
      locks: edits.flatMap((x) => (x.kind === 'lock' ? [{ shelf: x.shelf, week: x.week, itemIds: (previous?.[x.shelf]?.[x.week] ?? []).filter((id): id is number => id !== null) }] : [])),
      ...(previous && { previous }),
    };
    return { setup, labels, name, edition, again, edits, start, weeks, horizon, objective };
  }

  async plan(req: PlanRequest): Promise<PlanView> {
    const { setup, labels, name, edition, edits, start, weeks, horizon, objective } = this.#setup(req);
    const t0 = this.#now();
    const world = this.curation.world();
    const built = buildPlan(this.db, world, setup);
    const solved = await solvePlan(built.inst, req.method ?? 'auto', this.#now);
    const plan = solved.report.plan;
    const slots = plan
      ? plan.slots.flatMap((weeksOf, s) => weeksOf.flatMap((list, w) => Array.from(list, (c, slot) => ({ shelf: s, week: w, slot, itemId: c < 0 ? null : world.ctx.itemIds[built.inst.candidates[c]!]! }))))
      : [];
    const changed = plan && built.inst.previous ? countPlaced(plan) - keptCount(plan, built.inst.previous) : null;
    const row: Omit<StoredPlan, 'id'> = {
      name,
      edition,
      shelves: labels,
      start,
      weeks,
      horizon,
      objective,
      method: solved.report.method,
      status: solved.report.status,
      score: Number.isFinite(solved.report.objective) ? solved.report.objective : null,
      solvedAt: Date.now(),
    };
    // A plan that breaks a rule is shown with its diagnosis but not stored: the stored plan stays as it was.
    if (plan && solved.report.status !== 'infeasible') {
      this.db.transaction(() => {
        const id = this.plans.save(row, slots);
        this.plans.setEdits(id, edits);
      })();
    }
    const meter = plan ? meterPlan(built.inst, plan, built.relevance, built.fit) : null;
    return planView({ world, name, edition, built, solved, meter, changed, ms: this.#now() - t0, edits, drafts: this.#drafts(name) });
  }

  #drafts(name: string): { week: number; edition: string }[] {
    const p = this.plans.find(name);
    if (!p) return [];
    return this.plans.drafts(p.id).map((d) => ({ week: d.week + 1, edition: curationRepos(this.db).editions.get(d.editionId).label }));
  }

  /** The stored plan's items per shelf and week (workspace ids). */
  #stored(p: StoredPlan): (number | null)[][][] {
    const out: (number | null)[][][] = p.shelves.map(() => Array.from({ length: p.weeks }, () => [] as (number | null)[]));
    for (const r of this.plans.slots(p.id)) {
      const cell = out[r.shelf]?.[r.week];
      if (cell) cell[r.slot] = r.itemId;
    }
    return out;
  }

  list(): StoredPlan[] {
    return this.plans.list();
  }

  /** Re-reads a stored plan with its meter, solving nothing. */
  show(name: string): PlanView {
    const p = this.plans.byName(name);
    const { setup, edits } = this.#setup({ name, shelf: p.shelves[0]!, edition: p.edition });
    const t0 = this.#now();
    const world = this.curation.world();
    const built = buildPlan(this.db, world, setup);
    const plan = built.inst.previous!;
    const report = { plan, method: p.method, status: p.status as SolveReport['status'], objective: scorePlan(built.inst, plan).objective, ms: 0 };
    const meter = meterPlan(built.inst, plan, built.relevance, built.fit);
    return planView({ world, name, edition: p.edition, built, solved: { report, diagnosis: null, variables: 0 }, meter, changed: null, ms: this.#now() - t0, edits, drafts: this.#drafts(name) });
  }

  /** Replays the last `weeks` weeks of history with the planner against a popularity plan (backtest.ts). */
  async backtest(req: Pick<PlanRequest, 'shelf' | 'edition' | 'shelves' | 'horizon' | 'objective'> & { weeks: number }): Promise<PlanBacktest> {
    const { setup } = this.#setup({ ...req, start: '2000-01-03' });
    return backtestPlan(this.db, this.curation.world(), setup.shelves, setup.weeks, setup.horizon, setup.objective, this.#now);
  }

  /**
   * Turns planned week `week` (1-based) into a draft edition through the editions service: the template's
   * shelves and briefs, each planned item pinned at its slot (so the editor sees them as the plan's and the
   * fill keeps them), dated the week's date.
   */
  draft(name: string, week: number, label?: string): EditionView {
    const p = this.plans.byName(name);
    if (!Number.isInteger(week) || week < 1 || week > p.weeks) throw new InputError(`draft: week ${week} is outside the ${p.weeks}-week plan`, { column: 'draft' });
    const e = curationRepos(this.db).editions.byLabel(p.edition);
    const date = new Date(dateMs(p.start) + (week - 1) * 7 * 86_400_000).toISOString().slice(0, 10);
    const edition = label ?? `${p.name} · week ${week}`;
    const stored = this.#stored(p);
    const items = this.curation.items;
    this.db.transaction(() => {
      this.curation.newEdition(edition, date);
      p.shelves.forEach((l, s) => {
        const template = curationRepos(this.db).shelves.byLabel(e.id, l);
        this.curation.addShelf(edition, l, template.brief);
        (stored[s]?.[week - 1] ?? []).forEach((id, slot) => {
          if (id === null) return;
          const ext = items.byId(id)?.externalId;
          if (ext) this.curation.act(edition, l, { kind: 'pin', slot: slot + 1, item: ext }, `planned in '${p.name}'`);
        });
      });
      this.plans.recordDraft(p.id, week - 1, curationRepos(this.db).editions.byLabel(edition).id);
    })();
    return this.curation.showEdition(edition);
  }
}

function countPlaced(plan: { slots: Int32Array[][] }): number {
  let n = 0;
  for (const weeks of plan.slots) for (const list of weeks) for (const c of list) if (c >= 0) n++;
  return n;
}

/** The last word wins: one pin per shelf-week-item, one ban per item, one lock per shelf-week. */
function dedupe(edits: PlanEditRow[]): PlanEditRow[] {
  const seen = new Map<string, PlanEditRow>();
  for (const e of edits) {
    const key = e.kind === 'pin' ? `pin:${e.shelf}:${e.week}:${e.itemId}` : e.kind === 'ban' ? `ban:${e.itemId}` : `lock:${e.shelf}:${e.week}`;
    seen.delete(key);
    seen.set(key, e);
  }
  return [...seen.values()];
}
