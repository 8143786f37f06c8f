import { describeAutoDials, describeChoiceCost } from '../../../core/curation/choice-cost.ts';
import { reasonWords } from '../../../core/curation/reason-words.ts';
import type { ShelfView } from '../../../api/contracts/curation.ts';
import type { RequestOf } from '../../../api/contract.ts';
import { checkOutputFile, writeFileWhole } from '../../../services/user-file.ts';
import { call } from '../call.ts';
import { EXIT, type CliCommand, type CommandEnv, type OptionSpec } from '../command.ts';
import { list, num, positionals, str } from '../flags.ts';
import { describeExclusions } from '../../../core/curation/exclusion-words.ts';
import { formatNumber, table } from '../format.ts';
import { publishCheck, publishCheckLines } from '../../../core/editing/publish-check.ts';
import { UsageError } from '../command.ts';
import { renderWhatIf } from './meter-whatif.ts';
import { meterCommands, renderMeter } from './meter.ts';
import { EDITION_READINGS } from '../../../core/curation/readings.ts';

/** Editions, shelves and editorial actions on the command line. Thin: flags → one api call → print. */

type Brief = NonNullable<RequestOf<'shelf.add'>['brief']>;

const pct = (x: number | null) => (x === null ? '–' : `${Math.round(x * 100)}%`);
const val = (x: number | null) => (x === null ? '–' : formatNumber(x));

/** The shelf and its meter, compactly: what an editor needs after each action. */
export function renderShelf(v: ShelfView): string {
  const rows = v.slots.map((s) => [
    s.slot,
    s.item ?? '–',
    s.title ?? '(empty)',
    s.category ?? '',
    s.supplier ?? '',
    s.promoted ? 'Sponsored' : '',
    s.pinned ? 'pin' : '',
    s.rank === null ? '–' : `${formatNumber(s.rank)} of ${formatNumber(v.poolSize)}`,
  ]);
  const m = v.meter;
  const head = `${v.edition} / ${v.label}  (${v.size} slots${v.locked ? ', locked' : ''}, pool ${v.poolSize})`;

  const left = describeExclusions(v.excluded);
  const resting = left ? `\nleft out of the pool: ${left}` : '';
  const viol = v.violations.length ? `\nrules not met:\n${v.violations.map((x) => `  ${x.title}: ${x.reason}`).join('\n')}` : '';
  const dials = describeAutoDials(v.brief.autoDials, v.brief.weights);
  const price = describeChoiceCost(m.choiceCost ?? NaN) + (dials ? `\n${dials}` : '');
  const banned = [...v.ruleBans.map((b) => `${b.facet} ${b.value} (${b.reach})`), ...v.bans.map((b) => `${b.item} ${b.title} (${b.reach})`)];
  const bans = banned.length ? `\nbanned here: ${banned.join(', ')}` : '';
  return `${head}\n${table(['slot', 'item', 'title', 'category', 'supplier', 'sponsored', 'pin', 'rank'], rows)}${renderReasons(v)}\n\nmeter\n${renderMeter(v)}\n${price}${resting}${bans}${viol}${renderChanges(v)}`;
}

/** Each slot's main reason in words, as the app says it (core/curation/reason-words.ts). */
function renderReasons(v: ShelfView): string {
  const lines = v.slots.filter((s) => s.reason !== null).map((s) => `  ${s.slot}. ${reasonWords(s.reason!, { count: formatNumber })}`);
  return lines.length ? `\nwhy:\n${lines.join('\n')}` : '';
}

/** What the action or refill changed against the list before, and the relevance the kept list gives up. */
function renderChanges(v: ShelfView): string {
  const c = v.changes;
  if (!c) return '';
  const lines = [
    ...c.entered.map((e) => `  + ${e.item} ${e.title} at slot ${e.slot}`),
    ...c.left.map((e) => `  - ${e.item} ${e.title} from slot ${e.slot} (${e.why})`),
    ...c.moved.map((e) => `  ~ ${e.item} ${e.title} slot ${e.from} → ${e.to}`),
  ];
  const given = v.relevanceGivenUp === null || v.relevanceGivenUp === undefined ? '' : `\nrelevance given up against a refill: ${val(v.relevanceGivenUp)}`;
  return `\nchanged:${lines.length ? `\n${lines.join('\n')}` : ' nothing'}${given}`;
}

function printShelf(env: CommandEnv, v: ShelfView): number {
  env.io.out(env.json ? JSON.stringify(v, null, 2) : renderShelf(v));
  return EXIT.ok;
}


const BRIEF_OPTIONS: OptionSpec = {
  size: { type: 'string' },
  brief: { type: 'string' },
  quota: { type: 'string', multiple: true },
  'promoted-max': { type: 'string' },
  'promoted-min': { type: 'string' },
  rest: { type: 'string' },
  category: { type: 'string', multiple: true },
  audience: { type: 'string' },
};

/** The brief field each brief flag fills, inside shelf.add's and shelf.brief's request (flag-fields.ts). */
const BRIEF_FIELDS = {
  size: 'brief.size',
  brief: 'brief',
  quota: 'brief.rules.quotas',
  'promoted-max': 'brief.rules.promoted.maxCount',
  'promoted-min': 'brief.rules.promoted.minCount',
  rest: 'brief.rules.restPeriod',
  category: 'brief.include.categories',
  audience: 'brief.audience',
};

/** Only on `shelf brief`: taking quotas off the brief the shelf has. */
const DROP_QUOTA_OPTIONS: OptionSpec = {
  'drop-quota': { type: 'string', multiple: true },
  'no-quotas': { type: 'boolean' },
};

const DROP_QUOTA_ABOUT: Record<string, string> = {
  'drop-quota': 'repeatable: FACET[:VALUE], take that quota off first (FACET alone: the one naming no VALUE)',
  'no-quotas': 'remove every quota the brief has before any --quota is added',
};

/** One line per brief flag; `changing` is `shelf brief`, where a flag left out keeps what the brief has. */
function briefAbout(changing: boolean): Record<string, string> {
  const keep = ' (default: unchanged)';
  return {
    size: changing ? 'number of slots, 1 to 200 (default: keep the current size)' : 'number of slots, 1 to 200 (required unless --brief sets it)',
    brief: changing ? "a whole brief as JSON, replacing the shelf's brief; other flags apply on top" : 'a whole brief as JSON; the other flags apply on top of it',
    quota: changing
      ? 'repeatable: FACET:MAX[:VALUE], added to the quotas the brief already has (after --drop-quota, --no-quotas)'
      : 'repeatable: FACET:MAX[:VALUE], at most MAX items per category, supplier or tag',
    'promoted-max': `largest share of slots sponsored items may take, 0 to 1${changing ? keep : ' (default no limit)'}`,
    'promoted-min': `smallest share of slots sponsored items must take, 0 to 1${changing ? keep : ' (default none)'}`,
    rest: changing
      ? 'skip items shown on this many recent published editions unless pinned; 0 is off'
      : 'skip items shown on this many recent published editions unless pinned (default 0: off)',
    category: changing
      ? "repeatable: only items of this category; replaces the brief's category list"
      : 'repeatable: only items of this category (default every category)',
    audience: changing
      ? 'who it is for: everyone, group:N, group:NAME (a named group, followed across trainings) or bought:CATEGORY[:DAYS], DAYS default 90'
      : 'who it is for: everyone (default), group:N, group:NAME (a named group, followed across trainings) or bought:CATEGORY[:DAYS], DAYS default 90',
  };
}

const QUOTA_FACETS = ['category', 'supplier', 'tag'];

/** A quota as a brief may hold it; a --brief JSON is not checked yet when the flags are applied. */
type QuotaLike = { facet?: unknown; max?: unknown; value?: unknown };

/** How --drop-quota names a quota: FACET, or FACET:VALUE when the quota names a value. */
const quotaKey = (q: QuotaLike): string => (q.value === undefined ? String(q.facet) : `${String(q.facet)}:${String(q.value)}`);

/**
 * The quotas left after --no-quotas or --drop-quota (the array given back unchanged when neither is set).
 * A --drop-quota that matches none of the brief's quotas is a usage error listing the quotas it has.
 */
function dropQuotas(env: CommandEnv, current: unknown): unknown {
  const drops = list(env, 'drop-quota');
  const clear = env.values['no-quotas'] === true;
  if (!clear && drops.length === 0) return current;
  if (clear && drops.length > 0) throw new UsageError('--no-quotas already removes every quota; leave out --drop-quota');
  if (clear) return [];
  const have = Array.isArray(current) ? (current as QuotaLike[]) : [];
  const keys = drops.map((d) => {
    const [facet, ...value] = d.split(':');
    if (!QUOTA_FACETS.includes(facet ?? '') || (value.length > 0 && value.join(':') === '')) {
      throw new UsageError(`--drop-quota expects FACET[:VALUE] with FACET category, supplier or tag, got '${d}'`);
    }
    return d;
  });
  const missing = keys.filter((k) => !have.some((q) => quotaKey(q) === k));
  if (missing.length > 0) {
    const listed = have.map((q) => `${quotaKey(q)} (max ${String(q.max)})`).join(', ');
    throw new UsageError(
      `--drop-quota ${missing.map((k) => `'${k}'`).join(', ')}: no such quota on the brief; ` +
        (have.length ? `its quotas are ${listed}` : 'it has no quotas'),
    );
  }
  return have.filter((q) => !keys.includes(quotaKey(q)));
}

const REASON_ABOUT = "why, in your own words; kept in the shelf's action log (optional)";

/** A brief from --brief JSON (or a base brief), with the convenience flags on top. */
function briefFrom(env: CommandEnv, base: Brief | undefined): Brief {
  let b: Record<string, unknown>;
  const raw = str(env, 'brief');
  try {
    b = raw !== undefined ? (JSON.parse(raw) as Record<string, unknown>) : structuredClone((base ?? {}) as Record<string, unknown>);
  } catch (e) {
    throw new UsageError(`--brief is not valid JSON: ${(e as Error).message}`);
  }
  const size = num(env, 'size', (x) => Number.isInteger(x) && x >= 1, 'a whole number >= 1');
  if (size !== undefined) b['size'] = size;
  const rules = { ...((b['rules'] as Record<string, unknown> | undefined) ?? {}) };
  const kept = dropQuotas(env, rules['quotas']);
  if (kept !== rules['quotas']) rules['quotas'] = kept;
  const quotas = list(env, 'quota').map((q) => {
    const [facet, max, ...value] = q.split(':');
    if (!['category', 'supplier', 'tag'].includes(facet ?? '') || !/^\d+$/.test(max ?? '')) {
      throw new UsageError(`--quota expects FACET:MAX[:VALUE] with FACET category, supplier or tag, got '${q}'`);
    }
    return value.length ? { facet, max: Number(max), value: value.join(':') } : { facet, max: Number(max) };
  });
  if (quotas.length) rules['quotas'] = [...((rules['quotas'] as unknown[] | undefined) ?? []), ...quotas];
  const share = (x: number) => x >= 0 && x <= 1;
  const pmax = num(env, 'promoted-max', share, 'a share between 0 and 1');
  const pmin = num(env, 'promoted-min', share, 'a share between 0 and 1');
  if (pmax !== undefined || pmin !== undefined) {
    const p = { ...((rules['promoted'] as Record<string, unknown> | undefined) ?? {}) };
    if (pmax !== undefined) p['maxCount'] = pmax;
    if (pmin !== undefined) p['minCount'] = pmin;
    rules['promoted'] = p;
  }
  const rest = num(env, 'rest', (x) => Number.isInteger(x) && x >= 0, 'a whole number >= 0');
  if (rest !== undefined) rules['restPeriod'] = rest;
  b['rules'] = rules;
  const cats = list(env, 'category');
  if (cats.length) b['include'] = { ...((b['include'] as object | undefined) ?? {}), categories: cats };
  const aud = str(env, 'audience');
  if (aud !== undefined) {
    const m = /^(everyone)$|^group:(\d+)$|^bought:([^:]+)(?::(\d+))?$|^group:(.*\S.*)$/.exec(aud);
    if (!m) throw new UsageError(`--audience expects everyone, group:N, group:NAME or bought:CATEGORY[:DAYS], got '${aud}'`);
    // group:NAME aims at a named group; the service fills in the number that name carries now (0 until then).
    b['audience'] = m[1]
      ? { kind: 'everyone' }
      : m[2]
        ? { kind: 'group', group: Number(m[2]) }
        : m[5]
          ? { kind: 'group', group: 0, name: m[5].trim() }
          : { kind: 'rule', category: m[3], signalKinds: ['purchase'], withinDays: m[4] ? Number(m[4]) : 90 };
  }
  if (b['size'] === undefined) throw new UsageError('give the shelf a --size');
  return b as Brief;
}

const reasonOpt: OptionSpec = { reason: { type: 'string' } };

function actionCommand(
  name: string,
  summary: string,
  usage: string,
  options: OptionSpec,
  /** The field of the action each option fills (flag-fields.ts), e.g. { slot: 'action.slot' }. */
  fields: Record<string, string>,
  about: Record<string, string>,
  build: (env: CommandEnv, rest: string[]) => RequestOf<'shelf.act'>['action'],
  example = '',
): CliCommand {
  return {
    name: `shelf ${name}`,
    summary,
    usage: [usage],
    options: { ...options, ...reasonOpt },
    flagFields: { 'shelf.act': { ...fields, reason: 'reason' } },
    about: { ...about, reason: REASON_ABOUT },
    help: `example:\n  shelfwright shelf ${name} ${example}`,
    async run(env) {
      const [edition, shelf, ...rest] = env.positionals;
      if (!edition || !shelf) throw new UsageError('name the EDITION and the SHELF');
      const action = build(env, rest);
      const { table: t } = env.api();
      const reason = str(env, 'reason');
      return printShelf(env, await call(t, 'shelf.act', { edition, shelf, action, ...(reason ? { reason } : {}) }));
    },
  };
}

function oneItem(rest: string[]): string {
  if (rest.length !== 1) throw new UsageError(rest.length === 0 ? 'name the ITEM by its id' : `unexpected argument '${rest[1]}'`);
  return rest[0]!;
}

function slotFlag(env: CommandEnv, name: string): number {
  const s = num(env, name, (x) => Number.isInteger(x) && x >= 1, 'a slot number from 1');
  if (s === undefined) throw new UsageError(`give --${name} N`);
  return s;
}

/** The scope as typed; an until date before the edition is refused by the service (ban-scope.ts). */
const scopeOf = (env: CommandEnv): string => {
  const s = str(env, 'scope') ?? 'shelf';
  if (!/^(shelf|edition|later|always|until:\d{4}-\d{2}-\d{2})$/.test(s)) {
    throw new UsageError(`--scope must be shelf, edition, later, always or until:YYYY-MM-DD, got '${s}'`);
  }
  return s;
};

function shelfCommand(name: 'fill' | 'refill' | 'meter' | 'undo' | 'redo', summary: string, method: 'shelf.fill' | 'shelf.show' | 'shelf.undo' | 'shelf.redo'): CliCommand {
  return {
    name: `shelf ${name}`,
    summary,
    usage: ['EDITION SHELF'],
    options: {},
    flagFields: {},
    about: {},
    help: `example:\n  shelfwright shelf ${name} "week 10" Front`,
    async run(env) {
      const [edition, shelf] = positionals(env, ['EDITION', 'SHELF']);
      const { table: t } = env.api();
      return printShelf(env, await call(t, method, { edition: edition!, shelf: shelf! }));
    },
  };
}

export const curationCommands: CliCommand[] = [
  {
    name: 'edition new',
    summary: 'start an edition on a date (optionally from an earlier one: shelves and briefs, not slots)',
    usage: ['LABEL --date YYYY-MM-DD [--from LABEL]'],
    options: { date: { type: 'string' }, from: { type: 'string' } },
    flagFields: { 'edition.new': { date: 'date', from: 'from' } },
    about: {
      date: 'the date the edition runs, YYYY-MM-DD (required)',
      from: 'copy the shelves and briefs (not the slots) of this earlier edition',
    },
    help: 'example:\n  shelfwright edition new "week 11" --date 2026-03-09 --from "week 10"',
    async run(env) {
      const [label] = positionals(env, ['LABEL']);
      const date = str(env, 'date');
      if (!date) throw new UsageError('give the edition a --date YYYY-MM-DD');
      const from = str(env, 'from');
      const { table: t } = env.api();
      const v = await call(t, 'edition.new', { label: label!, date, ...(from ? { from } : {}) });
      if (env.json) env.io.out(JSON.stringify(v, null, 2));
      else env.io.out([`edition '${v.label}' (${v.date}, ${v.status}): ${v.shelves.length} shelves`, ...v.shelves.map(renderShelf)].join('\n\n'));
      return EXIT.ok;
    },
  },
  {
    name: 'edition list',
    summary: 'every edition with its date and status',
    usage: [''],
    options: {},
    flagFields: {},
    about: {},
    help: 'example:\n  shelfwright edition list --json',
    async run(env) {
      positionals(env, []);
      const { table: t } = env.api();
      const r = await call(t, 'edition.list', {});
      if (env.json) env.io.out(JSON.stringify(r, null, 2));
      else env.io.out(table(['edition', 'date', 'status'], r.editions.map((e) => [e.label, e.date, e.status])));
      return EXIT.ok;
    },
  },
  {
    name: 'edition show',
    summary: 'an edition: every shelf with its meter, and the edition meter',
    usage: ['LABEL'],
    options: {},
    flagFields: {},
    about: {},
    help: 'example:\n  shelfwright edition show "week 10"',
    async run(env) {
      const [label] = positionals(env, ['LABEL']);
      const { table: t } = env.api();
      const v = await call(t, 'edition.show', { edition: label! });
      if (env.json) env.io.out(JSON.stringify(v, null, 2));
      else {
        const m = v.meter;
        env.io.out(
          [
            `edition '${v.label}' (${v.date}, ${v.status})`,
            ...v.shelves.map(renderShelf),
            `edition meter: ${EDITION_READINGS.distinctItems.name} ${m.distinctItems} · ${EDITION_READINGS.supplierExposureGini.name} ${val(m.supplierExposureGini)} (0–1) · ${m.overlaps.length} overlapping shelf pairs`,
          ].join('\n\n'),
        );
      }
      return EXIT.ok;
    },
  },
  {
    name: 'edition publish',
    summary: 'freeze an edition into read-only history, after listing unmet rules and shelves never opened',
    usage: ['LABEL [--yes]'],
    options: { yes: { type: 'boolean' } },
    flagFields: { none: ['yes'] },
    about: { yes: 'publish without asking (required when no one is at a terminal to answer y/N)' },
    help: [
      'Publishing cannot be undone. The command first lists every rule a shelf does not meet and the shelves',
      'with no editorial action, then asks y/N at a terminal; elsewhere it needs --yes and otherwise changes nothing.',
      '',
      'example:',
      '  shelfwright edition publish "week 10" --yes',
    ].join('\n'),
    async run(env) {
      const [label] = positionals(env, ['LABEL']);
      const yes = env.values['yes'] === true;
      if (!yes && !env.io.ask) {
        throw new UsageError(`publishing '${label!}' cannot be undone: add --yes to publish (no terminal to ask y/N)`);
      }
      const { table: t } = env.api();
      const check = publishCheck(await call(t, 'edition.show', { edition: label! }));
      // With --json the check is part of the one JSON document; at a terminal question it goes to stderr first.
      const say = (line: string) => (env.json ? env.io.err(line) : env.io.out(line));
      if (!env.json || !yes) for (const line of publishCheckLines(check)) say(line);
      if (!yes) {
        const answer = (await env.io.ask!(`Publish '${label!}' now? It cannot be undone. [y/N] `)).trim().toLowerCase();
        if (answer !== 'y' && answer !== 'yes') {
          say(`not published: '${label!}' is still a draft`);
          return EXIT.ok;
        }
      }
      const r = await call(t, 'edition.publish', { edition: label! });
      env.io.out(env.json ? JSON.stringify({ ...r, ...check }, null, 2) : `published '${r.edition}': ${r.shelves} shelves, ${r.items} items`);
      return EXIT.ok;
    },
  },
  {
    name: 'edition compare',
    summary: 'per shelf, what edition B added, removed and moved relative to edition A',
    usage: ['A B'],
    options: {},
    flagFields: {},
    about: {},
    help: 'example:\n  shelfwright edition compare "week 10" "week 11"',
    async run(env) {
      const [a, b] = positionals(env, ['A', 'B']);
      const { table: t } = env.api();
      const r = await call(t, 'edition.compare', { a: a!, b: b! });
      if (env.json) env.io.out(JSON.stringify(r, null, 2));
      else {
        env.io.out(
          r.shelves
            .map((s) =>
              [
                `${s.label}${s.presence === 'both' ? '' : s.presence === 'onlyA' ? ` (only in ${a})` : ` (only in ${b})`}`,
                `  added:   ${s.added.join(', ') || '–'}`,
                `  removed: ${s.removed.join(', ') || '–'}`,
                `  moved:   ${s.moved.map((m) => `${m.item} ${m.from}→${m.to}`).join(', ') || '–'}`,
              ].join('\n'),
            )
            .join('\n'),
        );
      }
      return EXIT.ok;
    },
  },
  {
    name: 'edition export',
    summary: 'an edition as CSV, JSON or a standalone HTML preview',
    usage: ['LABEL --format csv|json|html [--out FILE]'],
    options: { format: { type: 'string' }, out: { type: 'string' } },
    flagFields: { 'edition.export': { format: 'format' }, none: ['out'] },
    about: { format: 'csv, json or html (required)', out: 'write the export to this file (default: print it on stdout); a CSV gets its notes beside it in FILE.notes.txt' },
    help: '  without --out the export is written to stdout\n\nexample:\n  shelfwright edition export "week 10" --format html --out week10.html',
    async run(env) {
      const [label] = positionals(env, ['LABEL']);
      const format = str(env, 'format');
      if (format !== 'csv' && format !== 'json' && format !== 'html') throw new UsageError(`--format must be csv, json or html, got '${format ?? ''}'`);
      const out = str(env, 'out');
      if (out) checkOutputFile(out); // a missing folder is said before any work, in plain words
      const { table: t } = env.api();
      const r = await call(t, 'edition.export', { edition: label!, format });
      if (out) {
        writeFileWhole(out, r.content);
        // A CSV's notes (columns, sponsored disclosure) go beside it: FILE without its extension + .notes.txt.
        const notes = r.notes ? `${out.replace(/\.[^./\\]*$/, '')}.notes.txt` : null;
        if (notes) writeFileWhole(notes, r.notes!.content);
        const wrote = notes ? `wrote ${out} and ${notes}` : `wrote ${out}`;
        env.io.out(env.json ? JSON.stringify({ format, file: out, ...(notes && { notes }), bytes: Buffer.byteLength(r.content) }) : wrote);
      } else if (env.json) env.io.out(JSON.stringify(r, null, 2));
      else {
        env.printFile(r.content);
        // The table alone on stdout; its notes on stderr, so a pipe still receives one clean CSV.
        if (r.notes) env.io.err(r.notes.content);
      }
      return EXIT.ok;
    },
  },
  {
    name: 'shelf add',
    summary: 'add a shelf to a draft edition and fill it',
    usage: ['EDITION LABEL --size N [--quota FACET:MAX[:VALUE]]... [--promoted-max SHARE] [--promoted-min SHARE] [--rest N] [--category NAME]... [--audience WHO] [--brief JSON]'],
    options: BRIEF_OPTIONS,
    flagFields: { 'shelf.add': BRIEF_FIELDS },
    about: briefAbout(false),
    help: [
      'example:',
      '  shelfwright shelf add "week 10" Front --size 8 --quota category:3 --promoted-max 0.25 --rest 1',
    ].join('\n'),
    async run(env) {
      const [edition, label] = positionals(env, ['EDITION', 'LABEL']);
      const brief = briefFrom(env, undefined);
      const { table: t } = env.api();
      return printShelf(env, await call(t, 'shelf.add', { edition: edition!, label: label!, brief }));
    },
  },
  {
    name: 'shelf brief',
    summary: "change a shelf's brief (quotas, promoted bounds, rest period, size): an undoable action that keeps the list where it can",
    usage: [
      'EDITION SHELF [--size N] [--quota FACET:MAX[:VALUE]]... [--drop-quota FACET[:VALUE]]... [--no-quotas] [--promoted-max SHARE] [--promoted-min SHARE] [--rest N] [--category NAME]... [--audience WHO] [--brief JSON]',
    ],
    options: { ...BRIEF_OPTIONS, ...DROP_QUOTA_OPTIONS, ...reasonOpt },
    flagFields: { 'shelf.brief': { ...BRIEF_FIELDS, reason: 'reason' }, none: ['drop-quota', 'no-quotas'] },
    about: { ...briefAbout(true), ...DROP_QUOTA_ABOUT, reason: REASON_ABOUT },
    help: [
      "Flags left out keep the brief's current value. Quotas: --no-quotas or --drop-quota first take quotas off,",
      'then each --quota is added; dropping a quota the brief does not have is refused and changes nothing.',
      "The change is an action in the shelf's log: the list keeps what the new brief allows ('shelf refill' starts",
      "over), and 'shelf undo' takes the change back.",
      '',
      'examples:',
      '  shelfwright shelf brief "week 10" Front --quota supplier:2 --promoted-max 0.2',
      '  shelfwright shelf brief "week 10" Front --drop-quota category --quota category:3',
    ].join('\n'),
    async run(env) {
      const [edition, shelf] = positionals(env, ['EDITION', 'SHELF']);
      const { table: t } = env.api();
      const current = await call(t, 'shelf.show', { edition: edition!, shelf: shelf! });
      const brief = briefFrom(env, current.brief as Brief);
      const reason = str(env, 'reason');
      return printShelf(env, await call(t, 'shelf.brief', { edition: edition!, shelf: shelf!, brief, ...(reason ? { reason } : {}) }));
    },
  },
  shelfCommand('refill', 'start the shelf over: fill it afresh (actions keep the list; a locked shelf stays as it is)', 'shelf.fill'),
  shelfCommand('fill', "the same as 'shelf refill'", 'shelf.fill'),
  shelfCommand('meter', 'a shelf as it stands with its meter and the rules it could not meet', 'shelf.show'),
  ...meterCommands,
  actionCommand('pin', 'fix an item at a slot', 'EDITION SHELF ITEM --slot N', { slot: { type: 'string' } }, { slot: 'action.slot' }, { slot: 'the slot to fix the item at, counting from 1 (required)' }, (env, rest) => ({
    kind: 'pin',
    item: oneItem(rest),
    slot: slotFlag(env, 'slot'),
  }), '"week 10" Front SKU-014 --slot 1 --reason "launch week"'),
  actionCommand('unpin', 'release a pinned slot', 'EDITION SHELF --slot N', { slot: { type: 'string' } }, { slot: 'action.slot' }, { slot: 'the pinned slot to release, counting from 1 (required)' }, (env, rest) => {
    if (rest.length) throw new UsageError(`unexpected argument '${rest[0]}'`);
    return { kind: 'unpin', slot: slotFlag(env, 'slot') };
  }, '"week 10" Front --slot 1'),
  actionCommand(
    'ban',
    'exclude an item, or every item of a category, supplier or tag',
    'EDITION SHELF (ITEM | --category X | --supplier X | --tag X) [--scope shelf|edition|later|until:YYYY-MM-DD|always]',
    { scope: { type: 'string' }, category: { type: 'string' }, supplier: { type: 'string' }, tag: { type: 'string' } },
    { scope: 'action.scope', category: 'action.value', supplier: 'action.value', tag: 'action.value' },
    {
      scope:
        'where the ban holds: shelf (default), edition (every shelf of this edition), later (this edition and every ' +
        "copy of it dated on or after it: 'edition new --from'), until:YYYY-MM-DD (as later, up to that date), or " +
        'always (every shelf, every edition)',
      category: 'ban every item of this category instead of one item',
      supplier: 'ban every item from this supplier instead of one item',
      tag: 'ban every item with this tag instead of one item',
    },
    (env, rest) => {
      const scope = scopeOf(env);
      const rules = (['category', 'supplier', 'tag'] as const).filter((f) => str(env, f) !== undefined);
      if (rules.length + rest.length !== 1) throw new UsageError('ban one ITEM or one of --category, --supplier, --tag');
      if (rules.length) return { kind: 'banRule', facet: rules[0]!, value: str(env, rules[0]!)!, scope };
      return { kind: 'ban', item: rest[0]!, scope };
    },
    '"week 10" Front SKU-007 --scope edition',
  ),
  actionCommand(
    'unban',
    "lift this shelf's ban on an item, or on a category, supplier or tag",
    'EDITION SHELF (ITEM | --category X | --supplier X | --tag X)',
    { category: { type: 'string' }, supplier: { type: 'string' }, tag: { type: 'string' } },
    { category: 'action.value', supplier: 'action.value', tag: 'action.value' },
    { category: 'lift the ban on this category', supplier: 'lift the ban on this supplier', tag: 'lift the ban on this tag' },
    (env, rest) => {
      const rules = (['category', 'supplier', 'tag'] as const).filter((f) => str(env, f) !== undefined);
      if (rules.length + rest.length !== 1) throw new UsageError('lift the ban on one ITEM or one of --category, --supplier, --tag');
      if (rules.length) return { kind: 'unbanRule', facet: rules[0]!, value: str(env, rules[0]!)! };
      return { kind: 'unban', item: rest[0]! };
    },
    '"week 10" Front SKU-007',
  ),
  actionCommand('boost', "raise an item's score by a factor", 'EDITION SHELF ITEM --factor F', { factor: { type: 'string' } }, { factor: 'action.factor' }, { factor: "multiply the item's score by this number above 0 (default 2)" }, (env, rest) => ({
    kind: 'boost',
    item: oneItem(rest),
    factor: num(env, 'factor', (x) => x > 0, 'a number above 0') ?? 2,
  }), '"week 10" Front SKU-021 --factor 1.5'),
  actionCommand('sink', "lower an item's score by a factor", 'EDITION SHELF ITEM --factor F', { factor: { type: 'string' } }, { factor: 'action.factor' }, { factor: "divide the item's score by this number above 0 (default 2)" }, (env, rest) => ({
    kind: 'sink',
    item: oneItem(rest),
    factor: num(env, 'factor', (x) => x > 0, 'a number above 0') ?? 2,
  }), '"week 10" Front SKU-021 --factor 3'),
  actionCommand('lock', 'freeze a shelf: later actions are recorded but it is not filled again', 'EDITION SHELF', {}, {}, {}, (_env, rest) => {
    if (rest.length) throw new UsageError(`unexpected argument '${rest[0]}'`);
    return { kind: 'lock' };
  }, '"week 10" Front'),
  actionCommand('unlock', 'unfreeze a shelf and fill it again', 'EDITION SHELF', {}, {}, {}, (_env, rest) => {
    if (rest.length) throw new UsageError(`unexpected argument '${rest[0]}'`);
    return { kind: 'unlock' };
  }, '"week 10" Front'),
  actionCommand('move', 'move the item at one slot to another by hand (it is pinned there)', 'EDITION SHELF --from A --to B', { from: { type: 'string' }, to: { type: 'string' } }, { from: 'action.from', to: 'action.to' }, {
    from: 'the slot whose item moves, counting from 1 (required)',
    to: 'the slot it moves to and is pinned at, counting from 1 (required)',
  }, (env, rest) => {
    if (rest.length) throw new UsageError(`unexpected argument '${rest[0]}'`);
    return { kind: 'move', from: slotFlag(env, 'from'), to: slotFlag(env, 'to') };
  }, '"week 10" Front --from 5 --to 1'),
  shelfCommand('undo', "undo the shelf's last action", 'shelf.undo'),
  shelfCommand('redo', "redo the shelf's last undone action", 'shelf.redo'),
  {
    name: 'shelf whatif',
    summary: 'for one slot, the best candidates and the change each would make to the meter',
    usage: ['EDITION SHELF --slot N [--n COUNT]'],
    options: { slot: { type: 'string' }, n: { type: 'string' } },
    flagFields: { 'shelf.whatif': { slot: 'slot', n: 'n' } },
    about: { slot: 'the slot to look at, counting from 1 (required)', n: 'how many candidates to list, 1 to 200 (default 10)' },
    help: '  --slot N   the slot, from 1\n  --n COUNT  how many candidates (default 10)\n\nexample:\n  shelfwright shelf whatif "week 10" Front --slot 3 --n 5',
    async run(env) {
      const [edition, shelf] = positionals(env, ['EDITION', 'SHELF']);
      const slot = slotFlag(env, 'slot');
      const n = num(env, 'n', (x) => Number.isInteger(x) && x >= 1 && x <= 200, 'a whole number from 1 to 200') ?? 10;
      const { table: t } = env.api();
      const r = await call(t, 'shelf.whatif', { edition: edition!, shelf: shelf!, slot, n });
      if (env.json) env.io.out(JSON.stringify(r, null, 2));
      else {
        const current = await call(t, 'shelf.show', { edition: edition!, shelf: shelf! });
        env.io.out(renderWhatIf(r, current.brief));
      }
      return EXIT.ok;
    },
  },
  {
    name: 'shelf backtest',
    summary: "share of the shelf's audience who engaged with its items in the latest window, beside a popularity list",
    usage: ['EDITION SHELF [--window DAYS]'],
    options: { window: { type: 'string' } },
    flagFields: { 'shelf.backtest': { window: 'windowDays' } },
    about: { window: 'days of the most recent signals held out for the check, 1 to 365 (default 28)' },
    help: '  --window DAYS  the held-out window (default 28)\n\nexample:\n  shelfwright shelf backtest "week 10" Front --window 28',
    async run(env) {
      const [edition, shelf] = positionals(env, ['EDITION', 'SHELF']);
      const windowDays = num(env, 'window', (x) => Number.isInteger(x) && x >= 1, 'a whole number of days') ?? 28;
      const { table: t } = env.api();
      const r = await call(t, 'shelf.backtest', { edition: edition!, shelf: shelf!, windowDays });
      if (env.json) env.io.out(JSON.stringify(r, null, 2));
      else
        env.io.out(
          [
            `window ${r.windowStart} .. ${r.windowEnd} (${r.windowDays} days), ${r.audienceActive} active audience members`,
            `  this shelf:       ${pct(r.shelf.share)} engaged (${r.shelf.engaged})`,
            `  popularity list:  ${pct(r.popularity.share)} engaged (${r.popularity.engaged})`,
            ...r.notes.map((n) => `note: ${n}`),
          ].join('\n'),
        );
      return EXIT.ok;
    },
  },
  {
    name: 'forget',
    summary: "erase one customer's signals and row on request",
    usage: ['CUSTOMER'],
    options: {},
    flagFields: {},
    about: {},
    help: 'example:\n  shelfwright forget C-1042',
    async run(env) {
      const [customer] = positionals(env, ['CUSTOMER']);
      const { table: t } = env.api();
      const r = await call(t, 'customer.forget', { customer: customer! });
      if (env.json) env.io.out(JSON.stringify(r, null, 2));
      else env.io.out(r.message);
      return EXIT.ok;
    },
  },
];
