/** Small catalogues for the curation tests: invented items, seeded vectors. */
import type { CurationContext } from '../../src-main/core/curation/context.ts';
import { buildCurationContext } from '../../src-main/core/curation/context.ts';
import type { EditorialState } from '../../src-main/core/curation/candidates.ts';
import type { Brief } from '../../src-main/core/curation/types.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import type { Item } from '../../src-main/core/types.ts';

export const EDITION = Date.UTC(2026, 5, 1);

export function item(id: number, over: Partial<Item> = {}): Item {
  return {
    id,
    externalId: `sku-${id}`,
    title: `Item ${id}`,
    description: '',
    category: 'Lamps',
    tags: [],
    supplier: 'Northwind Makers',
    price: 10,
    addedAt: EDITION - 10 * 86_400_000,
    promoted: false,
    available: true,
    attributes: {},
    ...over,
  };
}

export function context(items: Item[], vectors?: number[][], popularity?: number[]): CurationContext {
  const dim = vectors?.[0]?.length ?? 1;
  const v = new Float32Array(items.length * dim);
  items.forEach((_, i) => (vectors?.[i] ?? [1]).forEach((x, f) => (v[i * dim + f] = x)));
  return buildCurationContext(items, {
    vectors: v,
    dim,
    popularity: popularity ?? items.map(() => 0.5),
  });
}

const CATS = ['Lamps', 'Rugs', 'Mugs', 'Vases'];
const SUPPLIERS = ['Northwind Makers', 'Pebble & Pine', 'Quillfield Co', 'Harrow Loom', 'Tallow Works'];
const TAGS = ['linen', 'oak', 'glaze', 'brass', 'wool', 'clay'];

/** A seeded random catalogue of n items with non-negative dim-dimensional vectors. */
export function randomContext(seed: number, n: number, dim: number, promotedRate = 0.3, outOfStockRate = 0.1): CurationContext {
  const rng = seededRng(seed);
  const items: Item[] = [];
  for (let i = 0; i < n; i++) {
    const tags = TAGS.filter(() => rng.next() < 0.3);
    items.push(
      item(i + 1, {
        category: CATS[rng.int(CATS.length)] as string,
        supplier: SUPPLIERS[rng.int(SUPPLIERS.length)] as string,
        tags,
        price: 5 + rng.int(100),
        addedAt: rng.next() < 0.1 ? null : EDITION - rng.int(200) * 86_400_000,
        promoted: rng.next() < promotedRate,
        available: rng.next() >= outOfStockRate,
      }),
    );
  }
  const v = new Float32Array(n * dim);
  for (let k = 0; k < v.length; k++) v[k] = rng.next();
  return buildCurationContext(items, {
    vectors: v,
    dim,
    popularity: items.map(() => rng.next() * 0.5),
    customerCount: 1000,
  });
}

export function brief(over: Partial<Brief> = {}, rules: Partial<Brief['rules']> = {}): Brief {
  return {
    size: 4,
    anchors: [],
    audience: { kind: 'everyone' },
    include: { categories: [], tags: [], suppliers: [] },
    exclude: { categories: [], tags: [], suppliers: [] },
    priceBand: {},
    weights: { content: 1, collaborative: 1, audience: 0, popularity: 0, trend: 0, freshness: 0 },
    lambda: 0.7,
    ...over,
    rules: { quotas: [], promoted: {}, restPeriod: 0, allowRepeatInEdition: false, ...over.rules, ...rules },
  };
}

export function state(over: Partial<EditorialState> = {}): EditorialState {
  return { bans: new Set(), banRules: [], resting: new Set(), usedInEdition: new Set(), pins: new Map(), ...over };
}
