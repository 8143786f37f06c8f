import type { SignalKind } from '../core/types.ts';
import type { IdMaps, SignalBatch } from '../store/catalogue-writes.ts';
import { planColumns, type Mapping } from './fields.ts';
import { RejectLog, type RowError } from './rejects.ts';
import { SignalRows } from './signal-rows.ts';
import { readSource, type ImportFormat } from './source.ts';
import type { DateOrder } from './values.ts';

/** What reading a signal file needs. */
export interface SignalReadOptions {
  file: string;
  format: ImportFormat;
  mapping?: Mapping;
  delimiter?: string;
  dateOrder?: DateOrder;
  createCustomers: boolean;
  /** The kind of every row, for a file without a kind column (planColumns). */
  kind?: SignalKind;
  /** Rows dated after this (unix ms) are counted as future-dated; none when absent. */
  futureAfter?: number;
}

export interface SignalReadResult {
  /** Data rows read (rejected included). */
  rows: number;
  /** Rows handed out in batches. */
  valid: number;
  rejected: number;
  errorCount: number;
  errors: RowError[];
  /** Valid rows dated after `futureAfter`, and the latest of their times (NaN when none). */
  futureDated: number;
  latestFuture: number;
  /** undefined when the file had no header at all. */
  mapping: Mapping | undefined;
  delimiter: string | undefined;
}

/**
 * Reads, checks and resolves a signal file, handing each full batch of row ids to `emit` (the writer, or
 * the parsing thread's post to it: `transfer` then gives every batch arrays of its own, see SignalRows).
 */
export async function readSignals(o: SignalReadOptions, ids: IdMaps, emit: (b: SignalBatch) => void, transfer = false): Promise<SignalReadResult> {
  const rejects = new RejectLog(o.file);
  let rows: SignalRows | undefined;
  let early = 0; // broken rows before the header (JSON Lines)
  let mapping: Mapping | undefined;
  const info = await readSource(
    o.file,
    o.format,
    {
      header(headers, delimiter) {
        const plan = planColumns(o.file, 'signals', headers, o.mapping, o.kind);
        mapping = plan.mapping;
        rows = new SignalRows({ plan, dateOrder: o.dateOrder, delimiter }, ids, o.createCustomers, rejects, emit, transfer, o.futureAfter);
        rows.rows = early;
      },
      newColumn() {
        // An extra JSON key is no signal field; the width check applies to CSV only.
      },
      broken(line, reason) {
        rejects.record = undefined; // the reason names the record itself
        if (rows) rows.broken(line, reason);
        else {
          early++;
          rejects.add(line, null, reason);
        }
      },
      row(values, line, record) {
        rejects.record = record;
        rows!.row(values, line);
      },
    },
    o.delimiter,
  );
  rows?.end();
  const { rejected, errorCount, errors } = rejects;
  return {
    rows: rows?.rows ?? early, valid: rows?.valid ?? 0, rejected, errorCount, errors, mapping, delimiter: info.delimiter,
    futureDated: rows?.futureDated ?? 0, latestFuture: rows?.latestFuture ?? Number.NaN,
  };
}
