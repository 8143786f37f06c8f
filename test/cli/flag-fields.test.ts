import fs from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CONTRACT, type MethodName } from '../../src-main/api/contract.ts';
import { COMMANDS } from '../../src-main/shell/cli/commands/index.ts';
import { limitWords, schemaAt } from '../../src-main/shell/cli/limit-words.ts';
import { nearestOptions } from '../../src-main/shell/cli/option-errors.ts';
import { seededCli } from './seeded-cli.ts';

/**
 * Every flag the api's schema limits is named as the flag when the api refuses its value, over the mappings
 * each command declares (CliCommand.flagFields), so a new flag or command without a mapping fails here.
 */

/** Each declared (command, method, flag, field). */
const DECLARED = COMMANDS.flatMap((c) =>
  Object.entries(c.flagFields).flatMap(([method, flags]) =>
    method === 'none'
      ? []
      : Object.entries(flags as Record<string, string | readonly string[]>).flatMap(([flag, f]) =>
          (typeof f === 'string' ? [f] : f).map((field) => ({ command: c, method: method as MethodName, flag, field })),
        ),
  ),
);

/** zod 4's definition of a field's schema (the same internals limit-words.ts reads). */
interface FieldDef {
  type: string;
  checks?: { _zod: { def: { check: string; value?: number; inclusive?: boolean; format?: string } } }[];
  entries?: Record<string, string>;
}
const defOf = (method: MethodName, field: string) => schemaAt(CONTRACT[method].request, field.split('.'))?._zod.def as FieldDef | undefined;

/** Values past the field's limits (each end), as typed on the command line; none when the field has no limit. */
function pastLimits(d: FieldDef | undefined): string[] {
  if (!d) return [];
  if (d.type === 'enum') return ['no-such-choice'];
  if (d.type !== 'number') return [];
  const checks = (d.checks ?? []).map((c) => c._zod.def);
  const max = checks.find((c) => c.check === 'less_than');
  const min = checks.find((c) => c.check === 'greater_than');
  return [...(max?.value !== undefined ? [String(max.value + 1)] : []), ...(min?.value !== undefined ? [String(min.value - 1)] : [])];
}

/** What each command needs around the flag under test (positionals and required flags) on the seeded shop. */
const BASE: Record<string, string[]> = {
  import: ['items', 'no-such-items.csv'],
  'export signals': ['--format', 'parquet', '--out', 'no-such-folder'],
  'audience groups': [],
  demo: [],
  train: [],
  evaluate: [],
  similar: ['SKU-001'],
  propose: [],
  recommend: ['--all', '--out', 'never-written.csv', '--top', '5'],
  'edition new': ['week 20', '--date', '2026-03-16'],
  'edition export': ['week 10', '--format', 'csv'],
  'shelf add': ['week 10', 'Side', '--size', '4'],
  'shelf brief': ['week 10', 'Front'],
  'shelf pin': ['week 10', 'Front', 'SKU-001', '--slot', '1'],
  'shelf unpin': ['week 10', 'Front', '--slot', '1'],
  'shelf boost': ['week 10', 'Front', 'SKU-001'],
  'shelf sink': ['week 10', 'Front', 'SKU-001'],
  'shelf move': ['week 10', 'Front', '--from', '1', '--to', '2'],
  'shelf whatif': ['week 10', 'Front', '--slot', '1'],
  'shelf backtest': ['week 10', 'Front'],
  plan: ['Front', '--from', '2026-03-09'],
  'plan backtest': ['Front'],
};
/** A method of a command that needs more than the command's base (the holdout mode of evaluate). */
const BASE_FOR: Record<string, string[]> = { 'evaluate evaluate.holdout': ['--holdout', 'no-such-holdout.csv'] };

/** The command line for one case: the base without the flag under test, then the flag with its value. */
function argvFor(command: string, method: string, flag: string, value: string): string[] {
  const base = BASE_FOR[`${command} ${method}`] ?? BASE[command];
  if (!base) throw new Error(`test/cli/flag-fields.test.ts: add '${command}' to BASE (its positionals and required flags)`);
  const at = base.indexOf(`--${flag}`);
  const rest = at < 0 ? base : [...base.slice(0, at), ...base.slice(at + 2)];
  return [...command.split(' '), ...rest, `--${flag}=${value}`];
}

describe('every flag is declared: the request field it fills, or none', () => {
  it.each(COMMANDS.map((c) => [c.name, c] as const))('%s', (_name, c) => {
    const declared = new Set([...DECLARED.filter((d) => d.command === c).map((d) => d.flag), ...(c.flagFields.none ?? [])]);
    expect([...declared].sort()).toEqual(Object.keys(c.options).sort());
    for (const d of DECLARED.filter((x) => x.command === c)) {
      // A field the method's request does not have would never match a refusal.
      expect(defOf(d.method, d.field), `${c.name} --${d.flag} → ${d.method} ${d.field}`).toBeDefined();
    }
  });
});

describe("a value past the api's limit names the flag typed, and changes nothing", () => {
  const cli = seededCli('flags.sqlite');
  beforeAll(async () => {
    expect((await cli.run('edition', 'new', 'week 10', '--date', '2026-03-02')).code).toBe(0);
    expect((await cli.run('shelf', 'add', 'week 10', 'Front', '--size', '4')).code).toBe(0);
  });
  // A switch fills a field with yes or no: nothing to pass (parseArgs refuses a value for it, tested below).
  const cases = DECLARED.filter((d) => d.command.options[d.flag]?.type === 'string').flatMap((d) =>
    pastLimits(defOf(d.method, d.field)).map((value) => ({ ...d, value, words: limitWords(schemaAt(CONTRACT[d.method].request, d.field.split('.'))) })),
  );

  it('covers the limits of every kind of command (numbers and choices)', () => {
    // Enough cases that a broken walk over the schemas (no limits found) fails here.
    expect(cases.length).toBeGreaterThan(30);
    expect(new Set(cases.map((c) => c.command.name)).size).toBeGreaterThan(15);
  });

  it.each(cases.map((c) => [`${c.command.name} --${c.flag} ${c.value!}`, c] as const))('%s', async (_t, c) => {
    const before = fs.readFileSync(cli.file);
    const r = await cli.run(...argvFor(c.command.name, c.method, c.flag, c.value!));
    expect(r.code, r.err).toBe(1);
    const first = r.err.split('\n')[0]!;
    expect(first).toContain(`--${c.flag}`);
    // The whole limit the api enforces, in the schema's words, whichever check (the command's or the api's) said
    // it; a choice's own check may list the choices its way, but lists every one.
    if (c.value === 'no-such-choice') {
      expect(first).toContain(`--${c.flag} must be`);
      for (const choice of Object.values(defOf(c.method, c.field)!.entries!)) expect(first).toContain(choice);
      expect(first).toContain("got 'no-such-choice'");
    } else {
      // Every bound the schema states, e.g. "1" and "8" of "a whole number from 1 to 8".
      expect(first).toContain(`--${c.flag} must be `);
      const said = first.replace(/, got '.*$/, '');
      for (const bound of c.words!.match(/-?\d+(\.\d+)?/g) ?? []) expect(said).toMatch(new RegExp(`(^|[^\\d.])${bound.replace('.', '\\.')}($|[^\\d.])`));
      expect(first).toContain(`got '${c.value}'`);
    }
    // Not the schema's path or zod's own wording.
    expect(first).not.toContain(`${c.field}:`);
    expect(first).not.toMatch(/expected number to be|Invalid option/);
    expect(fs.readFileSync(cli.file).equals(before)).toBe(true);
  });
});

describe('limits said in words, from the schema', () => {
  const cli = seededCli('words.sqlite');
  beforeAll(async () => {
    expect((await cli.run('edition', 'new', 'week 10', '--date', '2026-03-02')).code).toBe(0);
    expect((await cli.run('shelf', 'add', 'week 10', 'Front', '--size', '4')).code).toBe(0);
  });

  it('train --threads 999 and --factors 100000 say the flag and the range', async () => {
    const t = await cli.run('train', '--threads', '999');
    expect(t.code).toBe(1);
    expect(t.err).toBe(`shelfwright train: --threads must be a whole number from 1 to ${String(maxOf('train.start', 'threads'))}, got '999'\nRun 'shelfwright train --help'.`);
    const f = await cli.run('train', '--factors', '100000');
    expect(f.err.split('\n')[0]).toBe(`shelfwright train: --factors must be a whole number from 1 to ${String(maxOf('train.start', 'ials.factors'))}, got '100000'`);
  });

  it("a brief's limit is said as the flag: --quota and --size", async () => {
    const before = fs.readFileSync(cli.file);
    const q = await cli.run('shelf', 'brief', 'week 10', 'Front', '--quota', 'tag:2', '--quota', 'category:0');
    expect(q.code).toBe(1);
    expect(q.err.split('\n')[0]).toBe("shelfwright shelf brief: --quota 'category:0': max must be a whole number >= 1");
    const s = await cli.run('shelf', 'add', 'week 10', 'Side', '--size', '5000');
    expect(s.err.split('\n')[0]).toBe(`shelfwright shelf add: --size must be a whole number from 1 to ${String(maxOf('shelf.add', 'brief.size'))}, got '5000'`);
    expect(fs.readFileSync(cli.file).equals(before)).toBe(true);
  });

  it('a field inside --brief JSON is said with the brief field in words', async () => {
    const r = await cli.run('shelf', 'brief', 'week 10', 'Front', '--brief', '{"size": 4, "lambda": 7}');
    expect(r.code).toBe(1);
    // The api's own words for the field (test/cli/bad-brief.test.ts: the same both ways in), after the flag.
    expect(r.err.split('\n')[0]).toBe(`shelfwright shelf brief: --brief '{"size": 4, "lambda": 7}': Relevance against variety (lambda): must be at most 1`);
  });

  it('a field no typed flag filled keeps the field name (a quota inside --brief, not --quota)', async () => {
    const r = await cli.run('shelf', 'brief', 'week 10', 'Front', '--brief', '{"size":4,"rules":{"quotas":[{"facet":"tag","max":0}]}}', '--quota', 'tag:2');
    expect(r.code).toBe(1);
    expect(r.err.split('\n')[0]).not.toContain('--quota');
    expect(r.err.split('\n')[0]).toContain('--brief');
  });
});

describe("a service's refusal of one field is said as the flag too (still a data error, exit 2)", () => {
  it('edition new --date and plan --commit', async () => {
    const cli = seededCli('service.sqlite');
    const d = await cli.run('edition', 'new', 'week 10', '--date', 'soon');
    expect(d.code).toBe(2);
    expect(d.err).toBe("shelfwright edition new: --date: expected a calendar date YYYY-MM-DD, got 'soon'");
    expect((await cli.run('edition', 'new', 'week 10', '--date', '2026-03-02')).code).toBe(0);
    expect((await cli.run('shelf', 'add', 'week 10', 'Front', '--size', '4')).code).toBe(0);
    const before = fs.readFileSync(cli.file);
    const c = await cli.run('plan', 'Front', '--from', '2026-03-09', '--commit', 'Mossgate=1', '--commit', 'Nowhere Ltd=2');
    expect(c.code).toBe(2);
    expect(c.err).toBe("shelfwright plan: --commit 'Nowhere Ltd=2': no supplier 'Nowhere Ltd' in the catalogue");
    const from = await cli.run('plan', 'Front', '--from', 'yesterday');
    expect(from.code).toBe(2);
    expect(from.err).toBe("shelfwright plan: --from: expected a calendar date YYYY-MM-DD, got 'yesterday'");
    const slot = await cli.run('shelf', 'pin', 'week 10', 'Front', 'SKU-001', '--slot', '99');
    expect(slot.code).toBe(2);
    expect(slot.err).toMatch(/^shelfwright shelf pin: --slot must be between 1 and 4, got 99$/);
    expect(fs.readFileSync(cli.file).equals(before)).toBe(true);
  });
});

/** The schema's own upper bound of a field: the message must say what the api enforces. */
function maxOf(method: MethodName, field: string): number {
  const words = limitWords(schemaAt(CONTRACT[method].request, field.split('.')));
  const m = / to (\d+)$/.exec(words ?? '');
  if (!m) throw new Error(`${method} ${field}: no upper bound in '${words ?? ''}'`);
  return Number(m[1]);
}

describe('unknown options and missing values', () => {
  const cli = seededCli('unknown.sqlite');

  it('an unknown option is said plainly, with the nearest known ones and the help to run', async () => {
    const r = await cli.run('train', '--values', 'log');
    expect(r.code).toBe(1);
    expect(r.err).toBe("shelfwright train: unknown option --values for 'shelfwright train'; did you mean --knn-values or --ease-values?\nRun 'shelfwright train --help'.");
    const typo = await cli.run('train', '--thread', '2');
    expect(typo.err.split('\n')[0]).toBe("shelfwright train: unknown option --thread for 'shelfwright train'; did you mean --threads?");
    const far = await cli.run('info', '--bogus');
    expect(far.err).toBe("shelfwright info: unknown option --bogus for 'shelfwright info'\nRun 'shelfwright info --help'.");
  });

  it('a missing value and a value given to a switch are said as the flag', async () => {
    expect((await cli.run('train', '--threads')).err.split('\n')[0]).toBe("shelfwright train: --threads needs a value (--threads VALUE, or --threads=VALUE for one that starts with '-')");
    expect((await cli.run('train', '--tune=yes')).err.split('\n')[0]).toBe('shelfwright train: --tune is a switch and takes no value');
  });

  // Suggesting the nearest option is common practice, no source; the distances are Levenshtein's (1966).
  it('nearest options: a part of a name, then edit distance 2 at most (Levenshtein 1966)', () => {
    const known = ['threads', 'knn-values', 'ease-values', 'k', 'seed', 'shrink'];
    expect(nearestOptions('values', known)).toEqual(['knn-values', 'ease-values']);
    // "sede" → "seed": two substitutions (Levenshtein distance 2, counted by hand).
    expect(nearestOptions('sede', known)).toEqual(['seed']);
    expect(nearestOptions('shrnk', known)).toEqual(['shrink']);
    expect(nearestOptions('bogus', known)).toEqual([]);
  });
});

describe('a refused flag leaves the workspace data as it was', () => {
  it('train, shelf brief and plan refusals write nothing to the file', async () => {
    const cli = seededCli('unchanged.sqlite');
    expect((await cli.run('edition', 'new', 'week 10', '--date', '2026-03-02')).code).toBe(0);
    expect((await cli.run('shelf', 'add', 'week 10', 'Front', '--size', '4')).code).toBe(0);
    const before = fs.readFileSync(cli.file);
    const refused = [
      ['train', '--threads', '999'],
      ['shelf', 'brief', 'week 10', 'Front', '--promoted-max', '2'],
      ['plan', 'Front', '--from', '2026-03-09', '--weeks', '999'],
    ];
    for (const argv of refused) expect((await cli.run(...argv)).code).toBe(1);
    expect(fs.readFileSync(cli.file).equals(before)).toBe(true);
    expect(fs.existsSync(path.join(path.dirname(cli.file), 'never-written.csv'))).toBe(false);
  });
});
