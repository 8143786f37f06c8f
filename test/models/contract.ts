import { describe, expect, it } from 'vitest';
import { csrFromDense, type Csr } from '../../src-main/core/matrix/csr.ts';
import type { Scorer } from '../../src-main/core/models/scorer.ts';

/**
 * The shared contract every Scorer must meet (STYLE.md §2, after benfred/implicit's
 * tests/recommender_base_test.py: a planted structure with one entry withheld, which must come back first).
 */
export interface PlantedCase {
  scorer: Scorer;
  /** Restores a scorer from `scorer.serialize()`. */
  load: (bytes: Uint8Array) => Scorer;
  /** The history the scorer reads (with the withheld entry removed). */
  history: Csr;
  customer: number;
  withheld: number;
  /** false where the planted answer is not meaningful for the model (e.g. a random baseline). Default true. */
  planted?: boolean;
}

/**
 * Block-diagonal interactions: customers of block b have every item of block b. Block 0 has more
 * customers (6) than the others (4), so even a non-personal popularity ranking puts the withheld item
 * (customer 0, item 0; it keeps 5 interactions against the others' 4) first among customer 0's unseen items.
 */
export function plantedBlocks(): { history: Csr; customer: number; withheld: number } {
  const customersPerBlock = [6, 4, 4];
  const itemsPerBlock = 4;
  const rows = customersPerBlock.reduce((a, b) => a + b, 0);
  const cols = itemsPerBlock * customersPerBlock.length;
  const dense = new Float64Array(rows * cols);
  let r = 0;
  customersPerBlock.forEach((n, b) => {
    for (let k = 0; k < n; k++, r++) for (let i = 0; i < itemsPerBlock; i++) dense[r * cols + b * itemsPerBlock + i] = 1;
  });
  dense[0] = 0; // customer 0, item 0 withheld
  return { history: csrFromDense(rows, cols, dense), customer: 0, withheld: 0 };
}

function scoresOf(s: Scorer, history: Csr, u: number): Float32Array {
  const out = new Float32Array(s.itemCount);
  s.scoreInto(u, history, out);
  return out;
}

export function describeScorerContract(name: string, makeFitted: () => PlantedCase): void {
  describe(`${name} meets the Scorer contract`, () => {
    it('ranks the withheld item first among the customer’s unseen items', (ctx) => {
      const c = makeFitted();
      if (c.planted === false) ctx.skip();
      const s = scoresOf(c.scorer, c.history, c.customer);
      const seen = new Set<number>();
      for (let p = c.history.indptr[c.customer]!; p < c.history.indptr[c.customer + 1]!; p++) seen.add(c.history.indices[p]!);
      expect(seen.has(c.withheld)).toBe(false);
      for (let j = 0; j < s.length; j++) {
        if (j !== c.withheld && !seen.has(j)) expect(s[c.withheld]!).toBeGreaterThan(s[j]!);
      }
    });

    it('gives a finite score for every customer and item', () => {
      const c = makeFitted();
      for (let u = 0; u < c.history.rows; u++) {
        const s = scoresOf(c.scorer, c.history, u);
        expect(s.length).toBe(c.scorer.itemCount);
        for (const v of s) expect(Number.isFinite(v)).toBe(true);
      }
    });

    it('lists similar items best first, without the item itself', () => {
      const c = makeFitted();
      const row = new Float32Array(c.scorer.itemCount);
      for (let i = 0; i < c.scorer.itemCount; i++) {
        const top = c.scorer.similarItems(i, 5);
        expect(top.items.length).toBe(top.scores.length);
        expect(top.items.length).toBeLessThanOrEqual(5);
        expect(Array.from(top.items)).not.toContain(i);
        for (let k = 1; k < top.scores.length; k++) expect(top.scores[k - 1]!).toBeGreaterThanOrEqual(top.scores[k]!);
        c.scorer.similarityInto(i, row);
        expect(row[i]).toBe(0);
        for (let k = 0; k < top.items.length; k++) expect(row[top.items[k]!]).toBeCloseTo(top.scores[k]!, 5);
      }
    });

    it('scores identically after serialize and load', () => {
      const c = makeFitted();
      const back = c.load(c.scorer.serialize());
      expect(back.kind).toBe(c.scorer.kind);
      expect(back.itemCount).toBe(c.scorer.itemCount);
      for (let u = 0; u < c.history.rows; u++) expect(scoresOf(back, c.history, u)).toEqual(scoresOf(c.scorer, c.history, u));
      const a = new Float32Array(c.scorer.itemCount);
      const b = new Float32Array(c.scorer.itemCount);
      for (let i = 0; i < c.scorer.itemCount; i++) {
        c.scorer.similarityInto(i, a);
        back.similarityInto(i, b);
        expect(b).toEqual(a);
        expect(back.similarItems(i, 3)).toEqual(c.scorer.similarItems(i, 3));
      }
    });
  });
}
