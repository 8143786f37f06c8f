import type { z } from 'zod';

/**
 * What a field of an api request may hold, in words ("a whole number from 1 to 8"), read from the request's
 * zod schema itself, so the command line says the limit the api enforces and the two cannot drift.
 */

/** zod 4's internals this reads: every schema's `_zod.def` (type, wrapped schema, checks, shape, options). */
interface Def {
  type: string;
  innerType?: Schema;
  in?: Schema;
  out?: Schema;
  element?: Schema;
  shape?: Record<string, Schema>;
  options?: Schema[];
  entries?: Record<string, string | number>;
  values?: unknown[];
  checks?: { _zod: { def: { check: string; value?: number; inclusive?: boolean; format?: string; minimum?: number; maximum?: number; length?: number } } }[];
}
interface Schema {
  _zod: { def: Def };
}

const WRAPPERS = new Set(['optional', 'nullable', 'default', 'prefault', 'readonly', 'catch', 'nonoptional']);

/** The schema without its optional/default/nullable wrappers (and a pipe's input side). */
function unwrap(s: Schema): Schema {
  for (let d = s._zod.def; ; d = s._zod.def) {
    if (WRAPPERS.has(d.type) && d.innerType) s = d.innerType;
    else if (d.type === 'pipe' && d.in) s = d.in;
    else return s;
  }
}

/** The schema of the field at `path` inside `root` (array indices step into the element), or undefined. */
export function schemaAt(root: z.ZodType, path: readonly PropertyKey[]): Schema | undefined {
  let s: Schema | undefined = unwrap(root as unknown as Schema);
  for (const key of path) {
    if (!s) return undefined;
    const d: Def = s._zod.def;
    if (d.type === 'array' && d.element && typeof key === 'number') s = unwrap(d.element);
    else if (d.type === 'object' && d.shape && typeof key === 'string' && Object.hasOwn(d.shape, key)) s = unwrap(d.shape[key]!);
    else if (d.type === 'union' && d.options) {
      // The first branch that has the field (a tagged union's branches share most fields and their limits).
      const rest = path.slice(path.indexOf(key));
      for (const o of d.options) {
        const found = schemaAt(o as unknown as z.ZodType, rest);
        if (found) return found;
      }
      return undefined;
    } else return undefined;
  }
  return s;
}

const fmt = (x: number) => String(x);

/** A number's bounds in words: "a whole number from 1 to 8", "a number above 0", "a share from 0 to 1". */
function numberWords(d: Def): string | undefined {
  let min: { value: number; inclusive: boolean } | undefined;
  let max: { value: number; inclusive: boolean } | undefined;
  let whole = false;
  for (const c of d.checks ?? []) {
    const k = c._zod.def;
    if (k.check === 'number_format' && (k.format === 'safeint' || k.format === 'int32' || k.format === 'uint32')) whole = true;
    else if (k.check === 'greater_than' && k.value !== undefined) min = { value: k.value, inclusive: k.inclusive ?? true };
    else if (k.check === 'less_than' && k.value !== undefined) max = { value: k.value, inclusive: k.inclusive ?? true };
  }
  const kind = whole ? 'a whole number' : 'a number';
  if (min && max && min.inclusive && max.inclusive) return `${kind} from ${fmt(min.value)} to ${fmt(max.value)}`;
  const low = min ? (min.inclusive ? `>= ${fmt(min.value)}` : `above ${fmt(min.value)}`) : '';
  const high = max ? (max.inclusive ? `<= ${fmt(max.value)}` : `below ${fmt(max.value)}`) : '';
  if (!low && !high) return kind;
  return `${kind} ${[low, high].filter(Boolean).join(' and ')}`;
}

const orList = (xs: readonly unknown[]) => (xs.length <= 1 ? xs.map(String).join('') : `${xs.slice(0, -1).map(String).join(', ')} or ${String(xs.at(-1))}`);

/** What the field may hold, in words (without "must be"), or undefined when the schema says nothing plain. */
export function limitWords(s: Schema | undefined): string | undefined {
  if (!s) return undefined;
  const d = s._zod.def;
  switch (d.type) {
    case 'number':
      return numberWords(d);
    case 'enum':
      return d.entries ? orList(Object.values(d.entries)) : undefined;
    case 'literal':
      return d.values ? orList(d.values) : undefined;
    case 'boolean':
      return 'true or false';
    case 'array':
    case 'string': {
      const len = (d.checks ?? []).map((c) => c._zod.def);
      const most = len.find((k) => k.check === 'max_length')?.maximum;
      const least = len.find((k) => k.check === 'min_length')?.minimum;
      const exactly = len.find((k) => k.check === 'length_equals')?.length;
      const what = d.type === 'array' ? 'entries' : 'characters';
      if (exactly === 1) return d.type === 'array' ? 'exactly one entry' : 'one character';
      if (exactly !== undefined) return `exactly ${exactly} ${what}`;
      if (most !== undefined && least !== undefined) return `${least} to ${most} ${what}`;
      if (most !== undefined) return `at most ${most} ${what}`;
      if (least === 1) return d.type === 'array' ? 'at least one entry' : 'not empty';
      if (least !== undefined) return `at least ${least} ${what}`;
      return undefined;
    }
    default:
      return undefined;
  }
}
