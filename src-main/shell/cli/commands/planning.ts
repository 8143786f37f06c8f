import type { RequestOf, ResponseOf } from '../../../api/contract.ts';
import { call } from '../call.ts';
import { EXIT, UsageError, type CliCommand, type CommandEnv } from '../command.ts';
import { int, list, num, positionals, str } from '../flags.ts';
import { formatNumber, table } from '../format.ts';

/** The rotation planner on the command line. Thin: flags → one api call → print. */

type PlanView = ResponseOf<'plan.solve'>;
const val = (x: number | null) => (x === null ? '–' : formatNumber(x));
const share = (x: number) => x >= 0 && x <= 1;

/** The plan as a calendar per shelf: weeks across, slots down; sponsored items say so in words. */
export function renderPlan(v: PlanView): string {
  const out: string[] = [];
  out.push(`plan '${v.name}': ${v.shelves.join(', ')} from edition '${v.edition}', ${v.weeks.length} weeks from ${v.start}`);
  out.push(`solved ${v.method === 'exact' ? 'exactly (MILP, HiGHS)' : 'by the heuristic'}: ${v.status}, objective ${val(v.objective)}, ${v.candidates} candidates of a pool of ${v.pool}, ${Math.round(v.ms)} ms${v.changed === null ? '' : `, ${v.changed} placements changed`}`);
  v.shelves.forEach((label, s) => {
    out.push('', label);
    const size = v.weeks[0]?.shelves[s]?.slots.length ?? 0;
    const rows = Array.from({ length: size }, (_, k) => [
      String(k + 1),
      ...v.weeks.map((w) => {
        const x = w.shelves[s]!.slots[k]!;
        if (x.item === null) return '(empty)';
        return `${x.item}${x.promoted ? ' sponsored' : ''}${x.pinned ? ' pin' : ''}`;
      }),
    ]);
    out.push(table(['slot', ...v.weeks.map((w) => `week ${w.week} ${w.date}${w.locked.includes(label) ? ' locked' : ''}`)], rows));
  });
  out.push('', 'meter');
  out.push(
    table(
      ['week', 'distinct items', 'supplier Gini', 'relevance', 'seasonal fit', 'value'],
      [
        ...v.weeks.map((w) => [String(w.week), w.meter.distinctItems, val(w.meter.supplierGini), val(w.meter.relevance), val(w.meter.seasonalFit), val(w.meter.value)]),
        ...(v.horizon ? [['horizon', v.horizon.distinctItems, val(v.horizon.supplierGini), val(v.horizon.relevance), val(v.horizon.seasonalFit), `weakest ${val(v.horizon.weakestWeekValue)}`]] : []),
      ],
    ),
  );
  if (v.forecast) {
    const f = v.forecast;
    out.push(
      '',
      `seasonal fit: ${f.method}; error on the last ${f.heldOutWeeks} weeks held out, MASE (Hyndman & Koehler 2006), lower is better:`,
      `  categories (${f.categories.series} series): ${val(f.categories.mase)}   seasonal naive: ${val(f.categories.baselineMase)}`,
      `  items (${f.items.series} series):      ${val(f.items.mase)}   seasonal naive: ${val(f.items.baselineMase)}`,
    );
  } else out.push('', 'seasonal fit: no forecast error measured (that needs a year of dated history plus held-out weeks)');
  if (v.diagnosis) {
    out.push('', 'the rules cannot all hold; the plan above breaks some and was not stored.');
    if (v.diagnosis.relaxations.length) out.push('each of these alone makes a plan possible (least change first):', ...v.diagnosis.relaxations.map((r) => `  ${r.family}: ${r.description}`));
    else out.push(`no single rule family's relaxation is enough; relaxing them all ${v.diagnosis.allTogether ? 'is' : 'is not'} enough`);
  }
  if (v.edits.pins.length || v.edits.bans.length || v.edits.locks.length) {
    out.push('', `edits: ${[...v.edits.pins.map((p) => `pin ${p.item} week ${p.week} ${p.shelf}`), ...v.edits.bans.map((b) => `ban ${b}`), ...v.edits.locks.map((l) => `lock week ${l.week} ${l.shelf}`)].join('; ')}`);
  }
  for (const d of v.drafts) out.push(`week ${d.week} is draft edition '${d.edition}'`);
  for (const n of v.notes) out.push(`note: ${n}`);
  return out.join('\n');
}

const HORIZON_OPTIONS = {
  edition: { type: 'string' },
  shelves: { type: 'string' },
  'rest-weeks': { type: 'string' },
  'max-appearances': { type: 'string' },
  'supplier-min-share': { type: 'string' },
  'supplier-max-share': { type: 'string' },
  commit: { type: 'string', multiple: true },
  'sponsored-max-share': { type: 'string' },
  'min-week-weight': { type: 'string' },
} as const;

/** The request field each horizon flag fills, in plan.solve's and plan.backtest's request (flag-fields.ts). */
const HORIZON_FIELDS = {
  edition: 'edition',
  shelves: 'shelves',
  'rest-weeks': 'horizon.restWeeks',
  'max-appearances': 'horizon.maxAppearances',
  'supplier-min-share': 'horizon.supplierMinShare',
  'supplier-max-share': 'horizon.supplierMaxShare',
  commit: 'horizon.commitments',
  'sponsored-max-share': 'horizon.sponsoredMaxShare',
  'min-week-weight': 'objective.minWeekWeight',
};

const HORIZON_ABOUT = {
  edition: 'the edition whose shelves are the template (default: the newest with the shelf)',
  shelves: 'more shelves of that edition to plan together, comma-separated',
  'rest-weeks': "weeks between two appearances of an item (default: the briefs' rest period)",
  'max-appearances': 'at most this many weeks per item (default: a third of the weeks, rounded up)',
  'supplier-min-share': 'every supplier with a candidate gets at least this share of the slots, 0 to 1 (default 0)',
  'supplier-max-share': 'no supplier takes more than this share of the slots, 0 to 1 (default 1)',
  commit: 'SUPPLIER=N: the supplier gets at least N slots over the horizon (repeatable)',
  'sponsored-max-share': 'sponsored items take at most this share of each week\'s slots, 0 to 1 (default 1)',
  'min-week-weight': 'β in (1 − β)·mean week + β·weakest week, 0 to 1 (default 0.3)',
};

function templateOf(env: CommandEnv, shelf: string) {
  const shares = (n: string) => num(env, n, share, 'a share between 0 and 1');
  const horizon: NonNullable<RequestOf<'plan.solve'>['horizon']> = {};
  const rest = int(env, 'rest-weeks', 0);
  if (rest !== undefined) horizon.restWeeks = rest;
  const m = int(env, 'max-appearances');
  if (m !== undefined) horizon.maxAppearances = m;
  const a = shares('supplier-min-share');
  if (a !== undefined) horizon.supplierMinShare = a;
  const b = shares('supplier-max-share');
  if (b !== undefined) horizon.supplierMaxShare = b;
  const c = shares('sponsored-max-share');
  if (c !== undefined) horizon.sponsoredMaxShare = c;
  const commits = list(env, 'commit').map((x) => {
    const k = x.lastIndexOf('=');
    const n = Number(x.slice(k + 1));
    if (k <= 0 || !Number.isInteger(n) || n < 1) throw new UsageError(`--commit must be SUPPLIER=N with N a whole number >= 1, got '${x}'`);
    return { supplier: x.slice(0, k), minSlots: n };
  });
  if (commits.length) horizon.commitments = commits;
  const beta = shares('min-week-weight');
  const edition = str(env, 'edition');
  const shelves = str(env, 'shelves');
  return {
    shelf,
    ...(edition !== undefined && { edition }),
    ...(shelves !== undefined && { shelves: shelves.split(',').map((x) => x.trim()).filter(Boolean) }),
    horizon,
    ...(beta !== undefined && { objective: { minWeekWeight: beta } }),
  };
}

function weekAt(x: string, flag: string, what: string): { head: string; week: number; shelf?: string } {
  const [head, w, shelf] = x.split('@');
  const week = Number(w);
  if (!head || !Number.isInteger(week) || week < 1) throw new UsageError(`--${flag} must be ${what}, got '${x}'`);
  return { head, week, ...(shelf !== undefined && shelf !== '' && { shelf }) };
}

export const planningCommands: CliCommand[] = [
  {
    name: 'plan',
    summary: 'plan the next weeks of a shelf (or several) at once under the rules; re-solve after pins, bans and locks',
    usage: ['SHELF --from DATE [--weeks N] [--name NAME] [--shelves A,B] [rules...] [--pin ITEM@WEEK[@SHELF]] [--ban ITEM] [--lock WEEK[@SHELF]] [--draft WEEK]'],
    options: {
      ...HORIZON_OPTIONS,
      from: { type: 'string' },
      weeks: { type: 'string' },
      name: { type: 'string' },
      pin: { type: 'string', multiple: true },
      ban: { type: 'string', multiple: true },
      lock: { type: 'string', multiple: true },
      'clear-edits': { type: 'boolean' },
      method: { type: 'string' },
      draft: { type: 'string' },
    },
    flagFields: {
      'plan.solve': { ...HORIZON_FIELDS, from: 'start', weeks: 'weeks', name: 'name', pin: 'pins', ban: 'bans', lock: 'locks', 'clear-edits': 'clearEdits', method: 'method' },
      'plan.draft': { draft: 'week' },
    },
    about: {
      ...HORIZON_ABOUT,
      from: 'date of the first planned week, YYYY-MM-DD (kept with a stored plan)',
      weeks: 'weeks to plan, 1 to 52 (default 6)',
      name: 'the plan\'s name; planning again under a stored name re-solves it, changing as little as it can',
      pin: 'ITEM@WEEK[@SHELF]: the item runs in that week (repeatable; weeks from 1)',
      ban: 'ITEM: kept out of the whole horizon (repeatable)',
      lock: 'WEEK[@SHELF]: that week keeps its planned items (repeatable; needs a stored plan)',
      'clear-edits': "forget the stored plan's pins, bans and locks first",
      method: 'auto (default: the heuristic, and the exact MILP when small enough), exact, or heuristic',
      draft: 'WEEK: then turn that planned week into a draft edition with the planned items pinned',
    },
    help:
      'Each planned week obeys the briefs\' rules (quotas, promoted shares, no item twice in a week); over the\n' +
      'horizon an item rests between appearances and runs at most --max-appearances weeks. The plan maximises\n' +
      '(1 − β)·mean + β·weakest week of predicted value (validated relevance × seasonal fit).\n\n' +
      'examples:\n  shelfwright plan Front --from 2026-12-07 --weeks 6 --shelves Newsletter,Garden --name winter\n' +
      '  shelfwright plan Front --name winter --pin I0042@3 --ban I0007 --lock 1\n  shelfwright plan Front --name winter --draft 2',
    async run(env) {
      const [shelf] = positionals(env, ['SHELF']);
      const weeks = int(env, 'weeks');
      const from = str(env, 'from');
      const name = str(env, 'name');
      const method = str(env, 'method');
      if (method !== undefined && !['auto', 'exact', 'heuristic'].includes(method)) throw new UsageError(`--method must be auto, exact or heuristic, got '${method}'`);
      const draft = int(env, 'draft');
      const req: RequestOf<'plan.solve'> = {
        ...templateOf(env, shelf!),
        ...(name !== undefined && { name }),
        ...(from !== undefined && { start: from }),
        ...(weeks !== undefined && { weeks }),
        ...(method !== undefined && { method: method as 'auto' | 'exact' | 'heuristic' }),
        ...(env.values['clear-edits'] === true && { clearEdits: true }),
      };
      const pins = list(env, 'pin').map((x) => weekAt(x, 'pin', 'ITEM@WEEK[@SHELF]'));
      if (pins.length) req.pins = pins.map((p) => ({ item: p.head, week: p.week, ...(p.shelf !== undefined && { shelf: p.shelf }) }));
      const bans = list(env, 'ban');
      if (bans.length) req.bans = bans;
      const locks = list(env, 'lock').map((x) => weekAt(`w@${x}`, 'lock', 'WEEK[@SHELF]'));
      if (locks.length) req.locks = locks.map((l) => ({ week: l.week, ...(l.shelf !== undefined && { shelf: l.shelf }) }));
      const { table: t } = env.api();
      const v = await call(t, 'plan.solve', req);
      let drafted: ResponseOf<'plan.draft'> | undefined;
      if (draft !== undefined) {
        if (v.status === 'infeasible') throw new UsageError('--draft: the plan breaks its rules and was not stored; relax a rule first');
        drafted = await call(t, 'plan.draft', { name: v.name, week: draft });
      }
      if (env.json) env.io.out(JSON.stringify(drafted ? { plan: v, draft: drafted } : v, null, 2));
      else {
        env.io.out(renderPlan(v));
        if (drafted) env.io.out(`\ndraft edition '${drafted.edition}' (${drafted.date}) made from week ${draft}: ${drafted.shelves.map((s) => `${s.label} ${s.items.filter((x) => x !== null).length} items pinned`).join(', ')}`);
      }
      return v.status === 'infeasible' ? EXIT.data : EXIT.ok;
    },
  },
  {
    name: 'plan show',
    summary: 'a stored plan with its meter, solving nothing',
    usage: ['NAME'],
    options: {},
    flagFields: {},
    about: {},
    async run(env) {
      const [name] = positionals(env, ['NAME']);
      const v = await call(env.api().table, 'plan.show', { name: name! });
      env.io.out(env.json ? JSON.stringify(v, null, 2) : renderPlan(v));
      return EXIT.ok;
    },
  },
  {
    name: 'plan list',
    summary: 'the stored plans',
    usage: [''],
    options: {},
    flagFields: {},
    about: {},
    async run(env) {
      positionals(env, []);
      const r = await call(env.api().table, 'plan.list', {});
      env.io.out(env.json ? JSON.stringify(r, null, 2) : r.length === 0 ? 'no plans yet' : table(['name', 'edition', 'shelves', 'from', 'weeks', 'solved'], r.map((p) => [p.name, p.edition, p.shelves.join(', '), p.start, p.weeks, `${p.method}, ${p.status}`])));
      return EXIT.ok;
    },
  },
  {
    name: 'plan backtest',
    summary: 'replay the last weeks of history with the planner against a popularity plan',
    usage: ['SHELF [--weeks N] [rules...]'],
    options: { ...HORIZON_OPTIONS, weeks: { type: 'string' } },
    flagFields: { 'plan.backtest': { ...HORIZON_FIELDS, weeks: 'weeks' } },
    about: { ...HORIZON_ABOUT, weeks: 'weeks of history to replay (default 6)' },
    async run(env) {
      const [shelf] = positionals(env, ['SHELF']);
      const weeks = int(env, 'weeks') ?? 6;
      const r = await call(env.api().table, 'plan.backtest', { ...templateOf(env, shelf!), weeks });
      if (env.json) env.io.out(JSON.stringify(r, null, 2));
      else {
        const pct = (x: number | null) => (x === null ? '–' : `${(x * 100).toFixed(1)}%`);
        env.io.out(
          [
            table(['week', 'from', 'active audience', 'engaged: plan', 'popularity plan', 'plan without season'], r.weeks.map((w) => [String(w.week), w.date, w.active, w.plan, w.popularity, w.withoutSeason])),
            `share of the active audience engaged with planned items: plan ${pct(r.share.plan)}, popularity plan ${pct(r.share.popularity)}, plan without seasonal fit ${pct(r.share.withoutSeason)} (same rules; planner: ${r.method})`,
            ...r.notes.map((n) => `note: ${n}`),
          ].join('\n'),
        );
      }
      return EXIT.ok;
    },
  },
];
