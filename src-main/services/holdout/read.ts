/**
 * Reads a holdout file: (customer, item, optional value, optional time) per row, CSV or JSON Lines (or a JSON
 * array), with the same header detection and column mapping as a signal import (ingest/fields.ts). A kind
 * column is not needed: a held-out pair is a pair, whatever the interaction was. Any unreadable row fails the
 * whole read with file, line and column — a metric computed on a silently shortened file would mislead.
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../../core/errors.ts';
import { safeBaseName } from '../staged-file.ts';
import { makeTempFolder } from '../temp-folders.ts';
import { planColumns, type ColumnPlan, type Mapping } from '../../ingest/fields.ts';
import { formatOf, readSource, type ImportFormat } from '../../ingest/source.ts';
import { isBad, isBlank, nonNegative, text, time, type DateOrder } from '../../ingest/values.ts';

/** A file on this machine, or its content sent by a page (the web shell's upload). */
export type HoldoutSource = { file: string } | { fileName: string; content: string };

export interface HoldoutReadOptions {
  format?: ImportFormat;
  delimiter?: string;
  mapping?: Mapping;
  dateOrder?: DateOrder;
}

export interface HoldoutRows {
  /** The name shown in messages: the path, or the uploaded file's name. */
  file: string;
  customer: string[];
  item: string[];
  /** NaN where the file has no value. */
  value: Float64Array;
  /** Unix ms; NaN where the file has no time. */
  at: Float64Array;
  mapping: Mapping;
}

/** The signal header words, but only customer and item are required (see planColumns). */
const KIND_PLACEHOLDER = '\u0000kind';

export async function readHoldout(source: HoldoutSource, o: HoldoutReadOptions = {}): Promise<HoldoutRows> {
  if ('file' in source) return readHoldoutFile(source.file, source.file, o);
  // Uploaded content goes through the same streaming reader via a private temporary file.
  const dir = makeTempFolder('holdout');
  const tmp = path.join(dir, safeBaseName(source.fileName, 'holdout.csv')); // never outside `dir`, whatever the name
  try {
    fs.writeFileSync(tmp, source.content, { mode: 0o600 });
    return await readHoldoutFile(tmp, source.fileName, o);
  } catch (e) {
    if (e instanceof InputError && e.where.file === tmp) throw new InputError(e.message, { ...e.where, file: source.fileName });
    throw e;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

async function readHoldoutFile(file: string, shownAs: string, o: HoldoutReadOptions): Promise<HoldoutRows> {
  const format = formatOf(shownAs, o.format);
  let plan: ColumnPlan | undefined;
  let commaDecimal = false;
  let csv = false;
  const customer: string[] = [];
  const item: string[] = [];
  const value: number[] = [];
  const at: number[] = [];
  const fail = (reason: string, line: number, col: number): never => {
    const column = csv ? col + 1 : (plan?.headers[col] ?? col + 1);
    throw new InputError(reason, { file: shownAs, line, column });
  };
  await readSource(
    file,
    format,
    {
      header(headers, delimiter) {
        csv = delimiter !== undefined;
        commaDecimal = delimiter !== undefined && delimiter !== ',';
        // planColumns requires a kind column for signals; a holdout has none, so a placeholder column that
        // is never read stands in for it unless the file brings its own.
        const explicit: Mapping = { ...o.mapping };
        const withKind = [...headers, KIND_PLACEHOLDER];
        try {
          plan = planColumns(shownAs, 'signals', withKind, explicit);
        } catch (e) {
          if (!(e instanceof InputError) || explicit.kind) throw e;
          plan = planColumns(shownAs, 'signals', withKind, { ...explicit, kind: KIND_PLACEHOLDER });
        }
        plan.headers.pop();
      },
      newColumn(name) {
        plan!.headers.push(name);
      },
      row(values, line) {
        const p = plan!;
        const read = (field: 'customer' | 'item'): string => {
          const i = p.index[field]!;
          const v = values[i];
          if (isBlank(v)) return fail(`${field} is empty`, line, i);
          const t = text(v);
          return isBad(t) ? fail(`${field}: ${t.bad}`, line, i) : t.trim();
        };
        customer.push(read('customer'));
        item.push(read('item'));
        const vi = p.index['value'] ?? -1;
        if (vi >= 0 && !isBlank(values[vi])) {
          const v = nonNegative(values[vi], commaDecimal);
          value.push(isBad(v) ? fail(`value: ${v.bad}`, line, vi) : v);
        } else value.push(Number.NaN);
        const ti = p.index['at'] ?? -1;
        if (ti >= 0 && !isBlank(values[ti])) {
          const t = time(values[ti], o.dateOrder);
          at.push(isBad(t) ? fail(`time: ${t.bad}`, line, ti) : t);
        } else at.push(Number.NaN);
      },
      broken(line, reason) {
        throw new InputError(reason, { file: shownAs, line });
      },
    },
    o.delimiter,
  );
  if (!plan) throw new InputError('the holdout file is empty: it needs a header and at least one row', { file: shownAs });
  if (customer.length === 0) throw new InputError('the holdout file has a header but no rows', { file: shownAs, line: 2 });
  return {
    file: shownAs,
    customer,
    item,
    value: Float64Array.from(value),
    at: Float64Array.from(at),
    mapping: Object.fromEntries(Object.entries(plan.mapping).filter(([, h]) => h !== KIND_PLACEHOLDER)) as Mapping,
  };
}
