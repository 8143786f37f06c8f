/**
 * Quota bookkeeping for a fill: "at most n items per category / supplier / tag on a shelf" (DESIGN.md),
 * or per one value when the quota names it. Counts live in one Int32Array per quota, indexed by facet code.
 */
import type { CurationContext } from './context.ts';
import type { Quota } from './types.ts';

interface CompiledQuota {
  quota: Quota;
  name: string;
  /** -1 = every value of the facet; -2 = a named value no item has (never binds); else the value's code. */
  code: number;
  counts: Int32Array;
}

/** How a quota is named in RuleViolation.rule, e.g. `quota category=Garden max 2` or `quota tag max 3`. */
export function quotaName(q: Quota): string {
  return `quota ${q.facet}${q.value !== undefined ? `=${q.value}` : ''} max ${q.max}`;
}

export class QuotaCounter {
  readonly #ctx: CurationContext;
  readonly #quotas: CompiledQuota[];

  constructor(ctx: CurationContext, quotas: readonly Quota[]) {
    this.#ctx = ctx;
    this.#quotas = quotas.map((q) => ({
      quota: q,
      name: quotaName(q),
      code: q.value === undefined ? -1 : (ctx.facets[q.facet].code.get(q.value) ?? -2),
      counts: new Int32Array(ctx.facets[q.facet].values.length),
    }));
  }

  /** Calls visit(quotaIndex, code) for each quota-counted value item i carries. */
  #each(i: number, visit: (k: number, code: number) => void): void {
    const ctx = this.#ctx;
    for (let k = 0; k < this.#quotas.length; k++) {
      const q = this.#quotas[k] as CompiledQuota;
      if (q.code === -2) continue;
      if (q.quota.facet === 'tag') {
        for (let p = ctx.tagPtr[i] as number, end = ctx.tagPtr[i + 1] as number; p < end; p++) {
          const c = ctx.tagCodes[p] as number;
          if (q.code === -1 || q.code === c) visit(k, c);
        }
      } else {
        const c = (q.quota.facet === 'category' ? ctx.category[i] : ctx.supplier[i]) as number;
        if (q.code === -1 || q.code === c) visit(k, c);
      }
    }
  }

  /** Whether adding item i keeps every quota. Allocation-free: the fill calls it per candidate per slot. */
  fits(i: number): boolean {
    const ctx = this.#ctx;
    for (let k = 0; k < this.#quotas.length; k++) {
      const q = this.#quotas[k] as CompiledQuota;
      if (q.code === -2) continue;
      const max = q.quota.max;
      if (q.quota.facet === 'tag') {
        for (let p = ctx.tagPtr[i] as number, end = ctx.tagPtr[i + 1] as number; p < end; p++) {
          const c = ctx.tagCodes[p] as number;
          if ((q.code === -1 || q.code === c) && (q.counts[c] as number) >= max) return false;
        }
      } else {
        const c = (q.quota.facet === 'category' ? ctx.category[i] : ctx.supplier[i]) as number;
        if ((q.code === -1 || q.code === c) && (q.counts[c] as number) >= max) return false;
      }
    }
    return true;
  }

  add(i: number): void {
    this.#each(i, (k, c) => {
      const counts = (this.#quotas[k] as CompiledQuota).counts;
      counts[c] = (counts[c] as number) + 1;
    });
  }

  /** The quotas (name and value) that adding item i would take past their limit. */
  breaches(i: number): { name: string; value: string }[] {
    const out: { name: string; value: string }[] = [];
    this.#each(i, (k, c) => {
      const q = this.#quotas[k] as CompiledQuota;
      if ((q.counts[c] as number) >= q.quota.max) {
        out.push({ name: q.name, value: this.#ctx.facets[q.quota.facet].values[c] as string });
      }
    });
    return out;
  }

  /** Quotas currently over their limit, with the value and its count. */
  over(): { name: string; value: string; count: number }[] {
    const out: { name: string; value: string; count: number }[] = [];
    for (const q of this.#quotas) {
      for (let c = 0; c < q.counts.length; c++) {
        const count = q.counts[c] as number;
        if (count > q.quota.max) out.push({ name: q.name, value: this.#ctx.facets[q.quota.facet].values[c] as string, count });
      }
    }
    return out;
  }
}
