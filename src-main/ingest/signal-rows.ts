import { SIGNAL_KINDS, type SignalKind } from '../core/types.ts';
import { SIGNAL_BATCH, type IdMaps, type SignalBatch } from '../store/catalogue-writes.ts';
import type { RejectLog } from './rejects.ts';
import { checkWidth, columnLabel, externalId, type Problem, type RowContext } from './rows.ts';
import { describe, isBad, isBlank, kind, nonNegative, time, type Bad } from './values.ts';

const KIND_CODE = new Map<SignalKind, number>(SIGNAL_KINDS.map((k, i) => [k, i]));

/**
 * Signal rows from raw values straight into typed-array batches of row ids: the same checks, messages
 * and order as `rowConverter` for signals (rows.ts), then the item and customer lookups, with no object
 * per row. Full batches go to `emit`; `end()` emits the last one (always, so the final row count arrives).
 * With `transfer` the emitted arrays are handed to another thread (their buffers detached), so each batch
 * gets fresh arrays; without it one batch is reused, `emit` being done with it when it returns.
 */
export class SignalRows {
  /** Data rows seen (rejected and broken ones included). */
  rows = 0;
  /** Rows that went into a batch. */
  valid = 0;
  /** Of those, rows dated after `futureAfter` (see SignalReadOptions), and the latest such time. */
  futureDated = 0;
  latestFuture = Number.NaN;
  readonly #futureAfter: number;
  readonly #ctx: RowContext;
  readonly #ids: IdMaps;
  readonly #create: boolean;
  readonly #rejects: RejectLog;
  readonly #emit: (b: SignalBatch) => void;
  readonly #problems: Problem[] = [];
  readonly #transfer: boolean;
  #batch: SignalBatch = newBatch();
  readonly #col: { customer: number; item: number; kind: number; value: number; at: number };
  readonly #value: (v: unknown) => number | Bad;
  readonly #at: (v: unknown) => number | Bad;
  readonly #everyRowKind: SignalKind | undefined;

  constructor(
    ctx: RowContext, ids: IdMaps, createCustomers: boolean, rejects: RejectLog, emit: (b: SignalBatch) => void, transfer = false,
    futureAfter = Number.POSITIVE_INFINITY,
  ) {
    this.#ctx = ctx;
    this.#futureAfter = futureAfter;
    this.#transfer = transfer;
    this.#ids = ids;
    this.#create = createCustomers;
    this.#rejects = rejects;
    this.#emit = emit;
    const at = (f: string) => ctx.plan.index[f] ?? -1;
    this.#everyRowKind = ctx.plan.everyRowKind;
    this.#col = { customer: at('customer'), item: at('item'), kind: at('kind'), value: at('value'), at: at('at') };
    const commaDecimal = ctx.delimiter !== undefined && ctx.delimiter !== ',';
    this.#value = (v) => (isBlank(v) ? 1 : nonNegative(v, commaDecimal));
    this.#at = (v) => (isBlank(v) ? Number.NaN : time(v, ctx.dateOrder));
  }

  broken(line: number, reason: string): void {
    this.rows++;
    this.#rejects.add(line, null, reason);
  }

  row(values: unknown[], line: number): void {
    this.rows++;
    const problems = this.#problems;
    problems.length = 0;
    const c = this.#col;
    if (checkWidth(this.#ctx, values, problems)) {
      const customer = this.#field(values, c.customer, 'customer', externalId);
      const item = this.#field(values, c.item, 'item', externalId);
      const k = this.#everyRowKind ?? this.#field(values, c.kind, 'kind', kind);
      const value = c.value >= 0 ? this.#field(values, c.value, 'value', this.#value) : 1;
      const at = c.at >= 0 ? this.#field(values, c.at, 'at', this.#at) : Number.NaN;
      if (problems.length === 0) {
        this.#resolve(customer!, item!, k!, value!, at!, line);
        return;
      }
    }
    // One rejected row counts once, however many of its cells are wrong; each cell is reported.
    for (let i = 0; i < problems.length; i++) this.#rejects.add(line, problems[i]!.column, problems[i]!.reason, i === 0);
  }

  end(): void {
    this.#send();
  }

  #field<T>(values: unknown[], i: number, name: string, conv: (v: unknown) => T | Bad): T | undefined {
    const out = conv(values[i]);
    if (!isBad(out)) return out;
    this.#problems.push({ column: columnLabel(this.#ctx, i), reason: `${name}: ${out.bad}` });
    return undefined;
  }

  #resolve(customer: string, item: string, k: SignalKind, value: number, at: number, line: number): void {
    const itemId = this.#ids.items.get(item);
    if (itemId < 0) {
      this.#rejects.add(line, columnLabel(this.#ctx, this.#col.item), `item: unknown item ${describe(item)}; signals never create items, import the catalogue first`);
      return;
    }
    const b = this.#batch;
    let customerId = this.#ids.customers.get(customer);
    if (customerId < 0) {
      if (!this.#create) {
        const reason = `customer: unknown customer ${describe(customer)}; import customers first, or let the import create them (--create-customers on the command line)`;
        this.#rejects.add(line, columnLabel(this.#ctx, this.#col.customer), reason);
        return;
      }
      customerId = this.#ids.nextCustomerId++;
      this.#ids.customers.set(customer, customerId);
      b.newCustomers.externalIds.push(customer);
      b.newCustomers.ids.push(customerId);
    }
    const r = b.n++;
    b.customer[r] = customerId;
    b.item[r] = itemId;
    b.kind[r] = KIND_CODE.get(k)!;
    b.value[r] = value;
    b.at[r] = at;
    this.valid++;
    if (at > this.#futureAfter) {
      this.futureDated++;
      if (!(at <= this.latestFuture)) this.latestFuture = at; // NaN at first
    }
    if (b.n === SIGNAL_BATCH) this.#send();
  }

  #send(): void {
    const b = this.#batch;
    b.rowsRead = this.rows;
    this.#emit(b);
    if (this.#transfer) {
      this.#batch = newBatch();
      return;
    }
    b.n = 0; // synchronous: the writer is done with the batch when `emit` returns, so it is reused
    b.newCustomers.externalIds.length = 0;
    b.newCustomers.ids.length = 0;
  }
}

function newBatch(): SignalBatch {
  return {
    n: 0,
    customer: new Float64Array(SIGNAL_BATCH),
    item: new Float64Array(SIGNAL_BATCH),
    kind: new Uint8Array(SIGNAL_BATCH),
    value: new Float64Array(SIGNAL_BATCH),
    at: new Float64Array(SIGNAL_BATCH),
    newCustomers: { externalIds: [], ids: [] },
    rowsRead: 0,
  };
}
