import type { IalsState } from '../../core/models/ials-fit.ts';
import type { IalsParams } from '../../core/models/ials-params.ts';

/** An iALS fit's state as the SharedArrayBuffers a worker thread receives (structured-clone safe). */
export interface SharedIals {
  params: IalsParams;
  customers: number;
  items: number;
  x: SharedArrayBuffer;
  y: SharedArrayBuffer;
  byCustomer: { indptr: SharedArrayBuffer; indices: SharedArrayBuffer; conf: SharedArrayBuffer };
  byItem: { indptr: SharedArrayBuffer; indices: SharedArrayBuffer; conf: SharedArrayBuffer };
  gramX: SharedArrayBuffer;
  gramY: SharedArrayBuffer;
  gramParts: SharedArrayBuffer;
  chunks: { customers: SharedArrayBuffer; items: SharedArrayBuffer };
  counter: SharedArrayBuffer;
  partials: SharedArrayBuffer;
}

/**
 * What a worker is asked to do: claim Gram blocks, or row chunks to solve, of a side from the shared
 * counter until none is left (ials-fit.ts, claimGramBlocks / claimSolveChunks).
 */
export interface PoolTask {
  id: number;
  op: 'gram' | 'solve';
  side: 'customers' | 'items';
  observed: boolean;
}

export interface PoolReply {
  id: number;
  /** How many blocks or chunks this worker took. */
  value?: number;
  error?: { name: string; message: string };
}

const sab = (a: ArrayBufferView): SharedArrayBuffer => {
  if (!(a.buffer instanceof SharedArrayBuffer) || a.byteOffset !== 0 || a.byteLength !== a.buffer.byteLength) {
    throw new Error('iALS state was not allocated in whole SharedArrayBuffers');
  }
  return a.buffer;
};

export function toShared(s: IalsState): SharedIals {
  const rows = (c: IalsState['byCustomer']) => ({ indptr: sab(c.indptr), indices: sab(c.indices), conf: sab(c.conf) });
  return {
    params: s.params,
    customers: s.customers,
    items: s.items,
    x: sab(s.x),
    y: sab(s.y),
    byCustomer: rows(s.byCustomer),
    byItem: rows(s.byItem),
    gramX: sab(s.gramX),
    gramY: sab(s.gramY),
    gramParts: sab(s.gramParts),
    chunks: { customers: sab(s.chunks.customers), items: sab(s.chunks.items) },
    counter: sab(s.counter),
    partials: sab(s.partials),
  };
}

export function fromShared(d: SharedIals): IalsState {
  const rows = (c: SharedIals['byCustomer'], n: number) => ({
    rows: n,
    indptr: new Int32Array(c.indptr),
    indices: new Int32Array(c.indices),
    conf: new Float32Array(c.conf),
  });
  return {
    params: d.params,
    k: d.params.factors,
    customers: d.customers,
    items: d.items,
    x: new Float32Array(d.x),
    y: new Float32Array(d.y),
    byCustomer: rows(d.byCustomer, d.customers),
    byItem: rows(d.byItem, d.items),
    gramX: new Float64Array(d.gramX),
    gramY: new Float64Array(d.gramY),
    gramParts: new Float64Array(d.gramParts),
    chunks: { customers: new Int32Array(d.chunks.customers), items: new Int32Array(d.chunks.items) },
    counter: new Int32Array(d.counter),
    partials: new Float64Array(d.partials),
  };
}
