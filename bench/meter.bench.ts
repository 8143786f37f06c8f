/**
 * Meter, what-if and fill timings on a synthetic catalogue the size of the demo shop (DESIGN.md
 * "Performance targets": full meter for a 24-slot shelf < 2 ms; what-if for 200 candidates < 20 ms).
 * Seeded, invented names. Run with `npm run bench:meter`; prints medians of many runs.
 */
import { buildCandidatePool } from '../src-main/core/curation/candidates.ts';
import { buildCurationContext } from '../src-main/core/curation/context.ts';
import { fillShelf } from '../src-main/core/curation/fill.ts';
import { meterShelf } from '../src-main/core/curation/meter.ts';
import type { MeterInputs } from '../src-main/core/curation/meter.ts';
import type { Brief } from '../src-main/core/curation/types.ts';
import { whatIfBatch } from '../src-main/core/curation/whatif.ts';
import { seededRng } from '../src-main/core/rng.ts';
import type { Item } from '../src-main/core/types.ts';
import { DAY_MS } from '../src-main/core/types.ts';

const N = 2500;
const DIM = 64;
const SLOTS = 24;
const EDITION = Date.UTC(2026, 5, 1);
const rng = seededRng(20260601);

const items: Item[] = Array.from({ length: N }, (_, i) => ({
  id: i + 1,
  externalId: `bench-${i + 1}`,
  title: `Bench item ${i + 1}`,
  description: '',
  category: `Category ${rng.int(24)}`,
  tags: Array.from({ length: rng.int(4) }, () => `tag-${rng.int(60)}`),
  supplier: `Supplier ${rng.int(120)}`,
  price: 5 + rng.int(200),
  addedAt: EDITION - rng.int(720) * DAY_MS,
  promoted: rng.next() < 0.15,
  available: rng.next() > 0.05,
  attributes: {},
}));
const vectors = Float32Array.from({ length: N * DIM }, () => rng.normal());
const ctx = buildCurationContext(items, {
  vectors,
  dim: DIM,
  popularity: Array.from({ length: N }, () => rng.next() * 0.3),
  customerCount: 20_000,
});
const inputs: MeterInputs = {
  editionDate: EDITION,
  relevance: Float64Array.from({ length: N }, () => rng.next()),
  audienceCategories: Float64Array.from({ length: ctx.facets.category.values.length }, () => rng.next()),
  ownedShare: Float64Array.from({ length: N }, () => rng.next() * 0.7),
};
const brief: Brief = {
  size: SLOTS,
  anchors: [],
  audience: { kind: 'everyone' },
  include: { categories: [], tags: [], suppliers: [] },
  exclude: { categories: [], tags: [], suppliers: [] },
  priceBand: {},
  weights: { content: 1, collaborative: 1, audience: 0, popularity: 0, trend: 0, freshness: 0 },
  lambda: 0.7,
  rules: {
    quotas: [
      { facet: 'category', max: 3 },
      { facet: 'supplier', max: 2 },
    ],
    promoted: { maxCount: 0.25, minExposure: 0.1 },
    restPeriod: 0,
    allowRepeatInEdition: false,
  },
};
const state = { bans: new Set<number>(), banRules: [], resting: new Set<number>(), usedInEdition: new Set<number>(), pins: new Map() };

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? (s[h] as number) : ((s[h - 1] as number) + (s[h] as number)) / 2;
}

function time(label: string, runs: number, target: number | null, fn: () => unknown): void {
  for (let r = 0; r < Math.min(20, runs); r++) fn(); // warm-up: let the JIT compile the hot loops
  const ms: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    fn();
    ms.push(performance.now() - t0);
  }
  const verdict = target === null ? '' : median(ms) < target ? ` (target < ${target} ms: met)` : ` (target < ${target} ms: MISSED)`;
  console.log(`${label}: median ${median(ms).toFixed(3)} ms over ${runs} runs${verdict}`);
}

const pool = buildCandidatePool(ctx, brief, state, EDITION);
const candidates = Array.from(pool.items, (index) => ({ index, relevance: inputs.relevance[index] as number }));
const filled = fillShelf({ ctx, brief, candidates, state, editionDate: EDITION });
const shelf = filled.slots;
const whatIfCands = Int32Array.from({ length: 200 }, (_, k) => pool.items[k * 7] as number);

console.log(`catalogue ${N} items, dim ${DIM}; pool ${pool.items.length}; shelf ${SLOTS} slots; violations ${filled.violations.length}`);
time('candidate pool (2,500 items)', 300, null, () => buildCandidatePool(ctx, brief, state, EDITION));
time('full meter, 24-slot shelf', 2000, 2, () => meterShelf(ctx, shelf, inputs));
time('what-if, 200 candidates x 1 slot', 500, 20, () => whatIfBatch(ctx, shelf, 5, whatIfCands, inputs));
time(`fill, 24 slots from a ${pool.items.length}-item pool`, 200, null, () =>
  fillShelf({ ctx, brief, candidates, state, editionDate: EDITION }),
);
