import type { AttributeValue } from '../core/types.ts';
import { cut } from '../core/util/cut.ts';
import type { CustomerWrite, ItemWrite, SignalWrite } from '../store/catalogue-writes.ts';
import type { ColumnPlan } from './fields.ts';
import { bool, describe, isBad, isBlank, kind, nonNegative, tags, text, time, type Bad, type DateOrder } from './values.ts';

/**
 * Turns one row of raw values into a typed row for the writer, or the reasons it is rejected. A column the
 * file does not have is left undefined (an update keeps the stored value); a present but blank cell means
 * "none" (empty text, null price or date, not promoted, available).
 */
/** An item row, and its picture cell: a path or address, null when blank (ingest/pictures.ts reads it). */
export type ItemInput = ItemWrite & { picture?: string | null };
export type CustomerInput = CustomerWrite;
export type SignalInput = SignalWrite;
export interface Problem {
  /** 1-based column number (CSV) or key (JSON). */
  column: number | string;
  reason: string;
}

export interface RowContext {
  plan: ColumnPlan;
  dateOrder: DateOrder | undefined;
  /** The CSV delimiter, when the source is CSV (decides ';' in tags and decimal commas). */
  delimiter: string | undefined;
}

export type Converter<T> = (values: unknown[], problems: Problem[]) => T | undefined;

export function rowConverter(ctx: RowContext): Converter<ItemInput | CustomerInput | SignalInput> {
  switch (ctx.plan.target) {
    case 'items':
      return itemConverter(ctx);
    case 'customers':
      return customerConverter(ctx);
    case 'signals':
      return signalConverter(ctx);
  }
}

/** Column label for a problem: the column number for CSV, the key for JSON. */
export function columnLabel(ctx: RowContext, i: number): number | string {
  const key = ctx.plan.headers[i];
  return ctx.delimiter !== undefined || key === undefined ? i + 1 : cut(key);
}

export function checkWidth(ctx: RowContext, values: unknown[], problems: Problem[]): boolean {
  if (ctx.delimiter === undefined || values.length === ctx.plan.headers.length) return true;
  problems.push({
    column: Math.min(values.length, ctx.plan.headers.length) + 1,
    reason: `the row has ${values.length} fields but the header has ${ctx.plan.headers.length}`,
  });
  return false;
}

/** Reads one field with a converter, recording a problem (and returning undefined) when it fails. */
function field<T>(
  ctx: RowContext, values: unknown[], problems: Problem[], name: string, conv: (v: unknown) => T | Bad,
): T | undefined {
  const i = ctx.plan.index[name] ?? -1;
  if (i < 0) return undefined;
  const out = conv(values[i]);
  if (isBad(out)) {
    problems.push({ column: columnLabel(ctx, i), reason: `${name}: ${out.bad}` });
    return undefined;
  }
  return out;
}

/** C0, DEL and C1 (ECMA-48): invisible in a list, and able to drive a terminal that prints the id. */
// eslint-disable-next-line no-control-regex -- refusing control characters is the point
const CONTROL = /[\u0000-\u001f\u007f-\u009f]/;
const CONTROLS = new RegExp(CONTROL.source, 'g');

/**
 * An id as the shop's system wrote it, trimmed. Control characters are refused: an id is looked up, typed
 * and printed, and one that cannot be seen cannot be typed (titles keep theirs; the command line shows them
 * escaped).
 */
export function externalId(v: unknown): string | Bad {
  if (isBlank(v)) return { bad: 'missing id' };
  const t = text(v);
  if (isBad(t)) return t;
  const id = t.trim();
  const at = id.search(CONTROL);
  if (at < 0) return id;
  const code = `U+${id.charCodeAt(at).toString(16).toUpperCase().padStart(4, '0')}`;
  return { bad: `an id may not hold control characters; ${describe(id.replace(CONTROLS, '?'))} has ${code} at character ${at + 1}` };
}

function attributes(ctx: RowContext, values: unknown[], problems: Problem[]): Record<string, AttributeValue> | undefined {
  if (ctx.plan.extra.length === 0) return undefined;
  const out: Record<string, AttributeValue> = {};
  for (const i of ctx.plan.extra) {
    const v = values[i];
    if (v === undefined || v === '') continue;
    if (v === null || typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') out[ctx.plan.headers[i]!] = v;
    else problems.push({ column: columnLabel(ctx, i), reason: `attribute ${cut(ctx.plan.headers[i]!)}: expected a plain value, got ${describe(v)}` });
  }
  return out;
}

const blankOr = <T>(conv: (v: unknown) => T | Bad, none: T) => (v: unknown): T | Bad => (isBlank(v) ? none : conv(v));

function itemConverter(ctx: RowContext): Converter<ItemInput> {
  const commaDecimal = ctx.delimiter !== undefined && ctx.delimiter !== ',';
  const semicolonTags = ctx.delimiter === ',';
  const plain = blankOr(text, '');
  const price = blankOr<number | null>((v) => nonNegative(v, commaDecimal), null);
  const added = blankOr<number | null>((v) => time(v, ctx.dateOrder), null);
  return (values, problems) => {
    if (!checkWidth(ctx, values, problems)) return undefined;
    const id = field(ctx, values, problems, 'id', externalId);
    const row: ItemInput = { externalId: id ?? '' };
    const set = <K extends keyof ItemInput>(k: K, v: ItemInput[K] | undefined) => {
      if (v !== undefined) row[k] = v;
    };
    set('title', field(ctx, values, problems, 'title', plain));
    set('description', field(ctx, values, problems, 'description', plain));
    set('category', field(ctx, values, problems, 'category', plain));
    set('tags', field(ctx, values, problems, 'tags', blankOr((v) => tags(v, semicolonTags), [])));
    set('supplier', field(ctx, values, problems, 'supplier', plain));
    set('price', field(ctx, values, problems, 'price', price));
    set('addedAt', field(ctx, values, problems, 'added_at', added));
    set('promoted', field(ctx, values, problems, 'promoted', blankOr(bool, false)));
    set('available', field(ctx, values, problems, 'available', blankOr(bool, true)));
    set('attributes', attributes(ctx, values, problems));
    set('picture', field(ctx, values, problems, 'image', blankOr<string | null>(text, null)));
    if (row.title !== undefined) row.title = row.title.trim();
    return problems.length === 0 ? row : undefined;
  };
}

function customerConverter(ctx: RowContext): Converter<CustomerInput> {
  return (values, problems) => {
    if (!checkWidth(ctx, values, problems)) return undefined;
    const id = field(ctx, values, problems, 'id', externalId);
    const attrs = attributes(ctx, values, problems);
    if (problems.length > 0 || id === undefined) return undefined;
    return attrs ? { externalId: id, attributes: attrs } : { externalId: id };
  };
}

function signalConverter(ctx: RowContext): Converter<SignalInput> {
  const commaDecimal = ctx.delimiter !== undefined && ctx.delimiter !== ',';
  const value = blankOr((v) => nonNegative(v, commaDecimal), 1);
  const at = blankOr<number | null>((v) => time(v, ctx.dateOrder), null);
  return (values, problems) => {
    if (!checkWidth(ctx, values, problems)) return undefined;
    const customer = field(ctx, values, problems, 'customer', externalId);
    const item = field(ctx, values, problems, 'item', externalId);
    const k = ctx.plan.everyRowKind ?? field(ctx, values, problems, 'kind', kind);
    const v = ctx.plan.index.value! >= 0 ? field(ctx, values, problems, 'value', value) : 1;
    const t = ctx.plan.index.at! >= 0 ? field(ctx, values, problems, 'at', at) : null;
    if (problems.length > 0) return undefined;
    return { customer: customer!, item: item!, kind: k!, value: v!, at: t! };
  };
}
