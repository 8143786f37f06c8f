import { seededRng } from '../../src-main/core/rng.ts';
import { DAY_MS, SIGNAL_KIND_CODE, type Dataset, type Item } from '../../src-main/core/types.ts';

/**
 * The synthetic shop the recency tunings are tested on: 6 taste clusters × 20 items; every customer likes two
 * clusters, A and B, and leaves 16 purchases at uniform random days over two years. `drift`: a customer buys from
 * A before a day of their own (uniform in the middle year) and from B after it, so the latest items say what comes
 * next; otherwise each purchase is from A or B at random whenever it happens, so its age says nothing.
 * `fashion` (with drift): within a cluster the purchase falls on one of 4 items of a window that moves on every 73
 * days, so recent popularity has something to find. `tagged`: each item is tagged with its cluster (content's
 * text). `timed` false: the same log without times. Seeded, deterministic.
 */
export function driftShop(o: { drift: boolean; seed: number; timed?: boolean; fashion?: boolean; tagged?: boolean }): Dataset {
  const rng = seededRng(o.seed);
  const clusters = 6;
  const per = 20;
  const customers = 500;
  const rows: [number, number, number][] = [];
  for (let u = 0; u < customers; u++) {
    const a = rng.int(clusters);
    const b = (a + 1 + rng.int(clusters - 1)) % clusters;
    const turn = 180 + rng.int(365);
    for (let s = 0; s < 16; s++) {
      const day = rng.int(730);
      const cluster = o.drift ? (day < turn ? a : b) : rng.next() < 0.5 ? a : b;
      const item = o.drift && o.fashion ? (Math.floor(day / 73) * 2 + rng.int(4)) % per : rng.int(per);
      rows.push([u, cluster * per + item, day]);
    }
  }
  const timed = o.timed ?? true;
  return {
    items: Array.from(
      { length: clusters * per },
      (_, i) =>
        ({
          id: i + 1,
          title: o.tagged ? `item ${i}` : '',
          description: '',
          tags: o.tagged ? [`cluster${Math.floor(i / per)}`] : [],
          category: '',
          supplier: '',
          price: null,
          addedAt: null,
        }) as unknown as Item,
    ),
    customerIds: Int32Array.from({ length: customers }, (_, i) => i + 1),
    customerExternalIds: Array.from({ length: customers }, (_, i) => `c${i}`),
    signals: {
      length: rows.length,
      customer: Int32Array.from(rows, (r) => r[0]),
      item: Int32Array.from(rows, (r) => r[1]),
      kind: new Uint8Array(rows.length).fill(SIGNAL_KIND_CODE.purchase),
      value: new Float32Array(rows.length).fill(1),
      at: Float64Array.from(rows, (r) => (timed ? Date.UTC(2024, 0, 1) + r[2] * DAY_MS : Number.NaN)),
    },
  };
}
