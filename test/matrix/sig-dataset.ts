import { DAY_MS, SIGNAL_KIND_CODE, type Dataset, type Item, type SignalKind } from '../../src-main/core/types.ts';

/** One signal of a hand-written log: customer and item indices, kind, value, and its time in days. */
export type Sig = [customer: number, item: number, kind: SignalKind, value: number, day: number];

/** A dataset of `customers` × `items` (ids only) holding exactly the signals given. */
export function dataset(customers: number, items: number, sigs: Sig[]): Dataset {
  return {
    items: Array.from({ length: items }, (_, i) => ({ id: i }) as Item),
    customerIds: Int32Array.from({ length: customers }, (_, i) => i + 1),
    customerExternalIds: Array.from({ length: customers }, (_, i) => `c${i}`),
    signals: {
      length: sigs.length,
      customer: Int32Array.from(sigs.map((s) => s[0])),
      item: Int32Array.from(sigs.map((s) => s[1])),
      kind: Uint8Array.from(sigs.map((s) => SIGNAL_KIND_CODE[s[2]])),
      value: Float32Array.from(sigs.map((s) => s[3])),
      at: Float64Array.from(sigs.map((s) => s[4] * DAY_MS)),
    },
  };
}
