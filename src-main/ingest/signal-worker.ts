import { parentPort, workerData } from 'node:worker_threads';
import { InputError } from '../core/errors.ts';
import { StringIdTable } from '../core/util/string-id-table.ts';
import type { IdMaps, SignalBatch } from '../store/catalogue-writes.ts';
import { readSignals } from './signal-read.ts';
import { AHEAD, type SignalThreadData, type SignalThreadMessage } from './signal-thread.ts';

/**
 * The parsing thread of a pipelined signal import (signal-thread.ts): reads, checks and resolves the file
 * exactly as the single-thread path does (the same `readSignals`), and posts each batch with its buffers
 * transferred. It writes nothing, so stopping it at any point leaves nothing to undo.
 */
const data = workerData as SignalThreadData;
const port = parentPort!;
const post = (m: SignalThreadMessage, transfer: ArrayBuffer[] = []) => port.postMessage(m, transfer);

const ids: IdMaps = {
  items: StringIdTable.from(data.items.keys, data.items.ids),
  customers: StringIdTable.from(data.customers.keys, data.customers.ids),
  nextCustomerId: data.nextCustomerId,
};
const unwritten = new Int32Array(data.unwritten);

/** Back-pressure: at most AHEAD batches posted and not yet written, so memory stays bounded on any file. */
function emit(b: SignalBatch): void {
  for (let n = Atomics.load(unwritten, 0); n >= AHEAD; n = Atomics.load(unwritten, 0)) Atomics.wait(unwritten, 0, n);
  Atomics.add(unwritten, 0, 1);
  post({ type: 'batch', batch: b }, [b.customer.buffer, b.item.buffer, b.kind.buffer, b.value.buffer, b.at.buffer] as ArrayBuffer[]);
}

try {
  const result = await readSignals(data.options, ids, emit, true);
  post({ type: 'done', result });
} catch (e) {
  const err = e instanceof Error ? e : new Error(String(e));
  post({ type: 'error', error: { name: err.name, message: err.message, where: e instanceof InputError ? e.where : undefined } });
}
