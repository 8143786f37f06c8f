/**
 * The pool's members: which items a shelf may propose, before any scoring (DESIGN.md "Data flow":
 * candidates = filters, availability, rest period, bans). Also counts why the others were left out, so the
 * editor can see that, say, 40 items are resting rather than wonder where they went.
 */
import { DAY_MS } from '../types.ts';
import { checkBrief } from './brief-check.ts';
import type { CurationContext } from './context.ts';
import type { Brief, Facet } from './types.ts';

/**
 * The editor's standing decisions for one shelf. All items are dense indices (`ctx.indexOfId` maps
 * workspace ids); slots are 0-based (slot 0 is position 1 on screen).
 */
export interface EditorialState {
  bans: ReadonlySet<number>;
  banRules: readonly { facet: Facet; value: string }[];
  /** Items that ran in the last `restPeriod` published editions (the caller reads the history). */
  resting: ReadonlySet<number>;
  /** Items already on another shelf of the edition being built. */
  usedInEdition: ReadonlySet<number>;
  pins: ReadonlyMap<number, number>;
}

/** Why an item is not in the pool. Each item counts once, under the first reason in this order. */
export const EXCLUSION_REASONS = [
  'outOfStock',
  'notYetAdded',
  'banned',
  'banRule',
  'resting',
  'category',
  'tag',
  'supplier',
  'price',
  'age',
  'inEdition',
] as const;
export type ExclusionReason = (typeof EXCLUSION_REASONS)[number];
export type ExclusionCounts = Record<ExclusionReason, number>;

export interface CandidatePool {
  /** Dense item indices, ascending. Includes available pinned items whatever the rules say. */
  items: Int32Array;
  excluded: ExclusionCounts;
}

/** A brief's filters as code masks over the context's facet codes, built once per call. */
export interface CompiledFilters {
  includeMask: Record<Facet, Uint8Array | null>;
  excludeMask: Record<Facet, Uint8Array | null>;
  banMask: Record<Facet, Uint8Array | null>;
  priceMin: number;
  priceMax: number;
  /** Items added before this time (unix ms) are too old; -Infinity = any age. */
  addedAfter: number;
  /** The edition's date (unix ms): items added later are not proposed. */
  editionDate: number;
  allowRepeat: boolean;
  restOn: boolean;
}

const FACETS: readonly Facet[] = ['category', 'supplier', 'tag'];

function mask(ctx: CurationContext, facet: Facet, values: readonly string[]): Uint8Array | null {
  if (values.length === 0) return null;
  const m = new Uint8Array(ctx.facets[facet].values.length);
  for (const v of values) {
    const c = ctx.facets[facet].code.get(v);
    if (c !== undefined) m[c] = 1;
  }
  return m;
}

function listOf(f: { categories: string[]; tags: string[]; suppliers: string[] }, facet: Facet): string[] {
  return facet === 'category' ? f.categories : facet === 'tag' ? f.tags : f.suppliers;
}

export function compileFilters(
  ctx: CurationContext,
  brief: Brief,
  state: EditorialState,
  editionDate: number,
): CompiledFilters {
  const inc = {} as Record<Facet, Uint8Array | null>;
  const exc = {} as Record<Facet, Uint8Array | null>;
  const ban = {} as Record<Facet, Uint8Array | null>;
  for (const f of FACETS) {
    inc[f] = mask(ctx, f, listOf(brief.include, f));
    exc[f] = mask(ctx, f, listOf(brief.exclude, f));
    ban[f] = mask(
      ctx,
      f,
      state.banRules.filter((r) => r.facet === f).map((r) => r.value),
    );
  }
  return {
    includeMask: inc,
    excludeMask: exc,
    banMask: ban,
    priceMin: brief.priceBand.min ?? -Infinity,
    priceMax: brief.priceBand.max ?? Infinity,
    addedAfter: brief.maxAgeDays === undefined ? -Infinity : editionDate - brief.maxAgeDays * DAY_MS,
    editionDate,
    allowRepeat: brief.rules.allowRepeatInEdition,
    restOn: brief.rules.restPeriod > 0,
  };
}

/** Whether item i carries any value marked in m (tags: any of its tags). */
function anyIn(ctx: CurationContext, facet: Facet, i: number, m: Uint8Array): boolean {
  if (facet === 'category') return m[ctx.category[i] as number] === 1;
  if (facet === 'supplier') return m[ctx.supplier[i] as number] === 1;
  for (let p = ctx.tagPtr[i] as number, end = ctx.tagPtr[i + 1] as number; p < end; p++) {
    if (m[ctx.tagCodes[p] as number] === 1) return true;
  }
  return false;
}

function facetMiss(ctx: CurationContext, cf: CompiledFilters, facet: Facet, i: number): boolean {
  const inc = cf.includeMask[facet];
  if (inc !== null && !anyIn(ctx, facet, i, inc)) return true;
  const exc = cf.excludeMask[facet];
  return exc !== null && anyIn(ctx, facet, i, exc);
}

/**
 * Every rule item i breaks, in EXCLUSION_REASONS order (empty = none). The pool uses the first; the fill
 * uses all of them to report what a pin overrides. An unknown price or date fails a set band or age
 * window: it cannot be shown to fit.
 */
export function exclusionReasons(
  ctx: CurationContext,
  cf: CompiledFilters,
  state: EditorialState,
  i: number,
  firstOnly = false,
): ExclusionReason[] {
  const out: ExclusionReason[] = [];
  const add = (r: ExclusionReason): boolean => {
    out.push(r);
    return firstOnly;
  };
  if (ctx.available[i] === 0 && add('outOfStock')) return out;
  // An item added after the edition's date did not exist yet for that edition (a back-dated edition, or
  // one built to compare against history); an unknown date is no reason to leave it out.
  if ((ctx.addedAt[i] as number) > cf.editionDate && add('notYetAdded')) return out;
  if (state.bans.has(i) && add('banned')) return out;
  let ruled = false;
  for (const f of FACETS) {
    const b = cf.banMask[f];
    if (b !== null && anyIn(ctx, f, i, b)) ruled = true;
  }
  if (ruled && add('banRule')) return out;
  if (cf.restOn && state.resting.has(i) && add('resting')) return out;
  if (facetMiss(ctx, cf, 'category', i) && add('category')) return out;
  if (facetMiss(ctx, cf, 'tag', i) && add('tag')) return out;
  if (facetMiss(ctx, cf, 'supplier', i) && add('supplier')) return out;
  const price = ctx.price[i] as number;
  const priceBandSet = cf.priceMin > -Infinity || cf.priceMax < Infinity;
  if (priceBandSet && !(price >= cf.priceMin && price <= cf.priceMax) && add('price')) return out;
  const added = ctx.addedAt[i] as number;
  if (cf.addedAfter > -Infinity && !(added >= cf.addedAfter) && add('age')) return out;
  if (!cf.allowRepeat && state.usedInEdition.has(i)) add('inEdition');
  return out;
}

function zeroCounts(): ExclusionCounts {
  const c = {} as ExclusionCounts;
  for (const r of EXCLUSION_REASONS) c[r] = 0;
  return c;
}

/**
 * The pool for a brief at an edition date (unix ms). Out-of-stock items are never proposed, pinned or not.
 * Other pinned items enter whatever the rules say (the pin is the editor's explicit choice); the fill
 * reports which rules they break.
 */
export function buildCandidatePool(
  ctx: CurationContext,
  brief: Brief,
  state: EditorialState,
  editionDate: number,
): CandidatePool {
  checkBrief(brief);
  const cf = compileFilters(ctx, brief, state, editionDate);
  const pinned = new Set(state.pins.values());
  const excluded = zeroCounts();
  const items = new Int32Array(ctx.n);
  let m = 0;
  for (let i = 0; i < ctx.n; i++) {
    if (pinned.has(i) && ctx.available[i] === 1) {
      items[m++] = i;
      continue;
    }
    const why = exclusionReasons(ctx, cf, state, i, true)[0];
    if (why === undefined) items[m++] = i;
    else excluded[why]++;
  }
  return { items: items.slice(0, m), excluded };
}
