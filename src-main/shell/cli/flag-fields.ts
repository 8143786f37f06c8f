import type { z } from 'zod';
import { CONTRACT, type MethodName } from '../../api/contract.ts';
import { fieldWords, issueWords, type IssueLike } from '../../core/curation/rule-words.ts';
import { UsageError, type CliCommand, type OptionValues } from './command.ts';
import type { FlagValueError } from './flags.ts';
import { limitWords, schemaAt } from './limit-words.ts';

/**
 * Which api request field each flag of a command fills, so a request the api's schema refuses is said as the
 * flag the user typed ("--threads must be a whole number from 1 to 8, got 999"), not as the field.
 *
 * Per api method the command calls: flag → the dotted field it fills ('ials.factors'; array indices left
 * out: 'brief.rules.quotas'). `none` lists the flags that fill no field the api checks (switches, files and
 * values the command reads or checks itself). Every option of a command is declared in one or the other
 * (test/cli/flag-fields.test.ts), so a new flag cannot go without.
 *
 * A repeatable flag's values are the last entries of the array it fills (after any a whole-object flag such
 * as --brief gave), so the entry the api refused is matched to the value that made it.
 */
export type FlagFields = { readonly [M in MethodName]?: Readonly<Record<string, string | readonly string[]>> } & { readonly none?: readonly string[] };

/** A request the api's schema refused before it was sent; main() says it as the command's flag. */
export class SchemaRefusal extends UsageError {
  readonly method: MethodName;
  readonly issue: IssueLike;
  readonly payload: unknown;
  constructor(method: MethodName, issue: IssueLike, payload: unknown) {
    super(fieldMessage(method, issue));
    this.method = method;
    this.issue = issue;
    this.payload = payload;
  }
}

/** Issues that say the field is out of its limits (a custom check's own message is kept instead). */
const LIMIT_CODES = new Set(['too_big', 'too_small', 'invalid_value', 'invalid_type', 'not_multiple_of']);

/** The refusal said with the field's name, for a field no flag of the command fills. */
function fieldMessage(method: MethodName, issue: IssueLike): string {
  // A brief's field is said in words, as the api says it (core/curation/rule-words.ts).
  if (fieldWords(issue.path) !== null) return issueWords(issue);
  const field = issue.path.map(String).join('.');
  const words = limitWords(schemaAt(CONTRACT[method].request, issue.path));
  if (field && words && LIMIT_CODES.has(issue.code ?? '')) return `${field} must be ${words}`;
  return `${field ? `${field}: ` : ''}${issue.message.replace(/^Too (big|small): /, 'too $1: ')}`;
}

const given = (v: OptionValues[string]): string[] =>
  v === undefined || v === false ? [] : Array.isArray(v) ? v.map(String) : [String(v)];

function valueAt(payload: unknown, path: readonly PropertyKey[]): unknown {
  let v = payload;
  for (const k of path) v = v !== null && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[k] : undefined;
  return v;
}

interface Match {
  flag: string;
  /** How many parts of the issue's path the flag's field covers. */
  depth: number;
  /** The flag's value that made the refused field. */
  raw: string;
  /** True when the field is inside one entry of an array the flag's values fill (one value, one entry). */
  entry: boolean;
}

/**
 * The flag that set the refused field: the typed flag whose field is the longest prefix of the issue's path
 * (array indices step over; a repeatable flag matches only the entries its values made).
 */
function flagFor(command: Pick<CliCommand, 'options'>, fields: NonNullable<FlagFields[MethodName]>, values: OptionValues, path: readonly PropertyKey[], payload: unknown): Match | undefined {
  let best: Match | undefined;
  for (const [flag, field] of Object.entries(fields).flatMap(([f, v]) => (typeof v === 'string' ? [v] : v).map((x) => [f, x] as const))) {
    const typed = given(values[flag]);
    if (typed.length === 0) continue;
    const want = field.split('.');
    let p = 0;
    let ok = true;
    for (const part of want) {
      while (typeof path[p] === 'number') p++;
      if (path[p] !== part) {
        ok = false;
        break;
      }
      p++;
    }
    if (!ok || (best && best.depth >= p)) continue;
    let raw = typed.at(-1)!;
    let entry = false;
    if (typeof path[p] === 'number' && command.options[flag]?.multiple === true) {
      const arr = valueAt(payload, path.slice(0, p));
      const first = Array.isArray(arr) ? arr.length - typed.length : 0;
      const k = (path[p] as number) - first;
      if (k < 0 || k >= typed.length) continue; // an entry the flag did not make (it came with --brief)
      raw = typed[k]!;
      entry = true;
    }
    best = { flag, depth: p, raw, entry };
  }
  return best;
}

/**
 * A schema refusal said as the flag: `--threads must be a whole number from 1 to 8, got '999'`; for a part of
 * one value of a repeatable flag (a quota's max), `--quota 'category:0': max must be a whole number >= 1`; for
 * a field inside what one flag gave (a brief in --brief JSON), the flag, then the api's own words for the field
 * (so the app and the command line say the same). A field no typed flag fills keeps its name.
 */
export function refusalWords(command: Pick<CliCommand, 'flagFields' | 'options'>, values: OptionValues, r: SchemaRefusal): string {
  const fields = command.flagFields[r.method];
  const path = r.issue.path;
  const match = fields ? flagFor(command, fields, values, path, r.payload) : undefined;
  if (!match) return r.message;
  const words = limitWords(schemaAt(CONTRACT[r.method].request, path));
  const must = words && LIMIT_CODES.has(r.issue.code ?? '') ? `must be ${words}` : issueWords({ ...r.issue, path: [] });
  const rest = path.slice(match.depth).filter((k) => typeof k !== 'number').map(String);
  if (rest.length === 0 && words && LIMIT_CODES.has(r.issue.code ?? '')) return `--${match.flag} ${must}, got '${match.raw}'`;
  if (match.entry) return `--${match.flag} '${match.raw}': ${rest.join('.')} ${must}`;
  // The value typed is repeated when short enough to read (a whole brief is not).
  const shown = match.raw.length <= 40 ? ` '${match.raw}'` : '';
  const field = `${path.map(String).join('.')}: `;
  return `--${match.flag}${shown}: ${r.message.startsWith(field) ? r.message.slice(field.length) : r.message}`;
}

/**
 * A service's refusal of one request field (`where.column` is the field's path, 'date' or
 * 'horizon.commitments[0].supplier', or a typed flag's own name) said as the flag typed: `--date: expected a calendar date ...`, or
 * `--commit 'X=9': no supplier 'X' ...` for a part of one value. Undefined when no typed flag fills it (the
 * field's name stays). `text` is the error as describeApiError says it, starting with the column.
 */
export function apiRefusalWords(command: Pick<CliCommand, 'flagFields' | 'options'>, values: OptionValues, column: string, text: string): string | undefined {
  const path = column
    .replace(/\[(\d+)\]/g, '.$1')
    .split('.')
    .filter((p) => p !== '')
    .map((p) => (/^\d+$/.test(p) ? Number(p) : p));
  let match: Match | undefined;
  for (const [method, fields] of Object.entries(command.flagFields)) {
    if (method === 'none') continue;
    const m = flagFor(command, fields as NonNullable<FlagFields[MethodName]>, values, path, undefined);
    if (m && (!match || m.depth > match.depth)) match = m;
  }
  // A service that names the value by the flag's own name (plan's `from`, `pin`; an action's `slot`).
  const typed = given(values[column]);
  if (!match && Object.hasOwn(command.options, column) && typed.length > 0) match = { flag: column, depth: path.length, raw: typed.at(-1)!, entry: false };
  if (!match) return undefined;
  const rest = text.startsWith(`${column}: `) ? text.slice(column.length + 2) : text.startsWith(`${column} `) ? text.slice(column.length + 1) : null;
  if (rest === null) return `--${match.flag}: ${text}`;
  const inner = path.slice(match.depth).some((k) => typeof k !== 'number');
  if (inner) return `--${match.flag} '${match.raw}': ${rest}`;
  return text.startsWith(`${column}: `) ? `--${match.flag}: ${rest}` : `--${match.flag} ${rest}`;
}

/**
 * A number the command's own check refused, said with the limit of the field the flag fills when the value is
 * past that limit too (so `--factors 0` and `--factors 5000` both say "a whole number from 1 to 1024").
 */
export function flagValueWords(command: Pick<CliCommand, 'flagFields'>, e: FlagValueError): string | undefined {
  const said = new Set<string>();
  for (const [method, fields] of Object.entries(command.flagFields)) {
    if (method === 'none') continue;
    const f = (fields as Record<string, string | readonly string[]>)[e.flag];
    if (f === undefined) continue;
    const field = typeof f === 'string' ? f : f[0]!;
    const schema = schemaAt(CONTRACT[method as MethodName].request, field.split('.'));
    const words = limitWords(schema);
    const x = e.raw.trim() === '' ? Number.NaN : Number(e.raw);
    if (!schema || !words || (schema as unknown as z.ZodType).safeParse(x).success) return undefined;
    said.add(words);
  }
  // A flag whose methods differ in their limits (evaluate --k: 200, or 500 with --holdout) keeps the command's
  // own words, which know the mode; so do words that already give the field's bounds ("a number of plain
  // fits from 0.5 to 20").
  if (said.size !== 1) return undefined;
  const words = [...said][0]!;
  if (boundsIn(words).every((b) => boundsIn(e.message).includes(b))) return undefined;
  return `--${e.flag} must be ${words}, got '${e.raw}'`;
}

/** The numbers a limit states, before the value quoted after "got". */
function boundsIn(text: string): string[] {
  return text.replace(/, got '.*$/s, '').match(/-?\d+(\.\d+)?/g) ?? [];
}
