import { describe, expect, it } from 'vitest';
import { CancelledError } from '../../src-main/core/errors.ts';
import { fitIals } from '../../src-main/core/models/ials.ts';
import { fitIalsThreaded } from '../../src-main/services/train/ials-threads.ts';
import { randomInteractions } from '../models/ials-fixtures.ts';

const params = { factors: 12, regularization: 0.05, alpha: 2, iterations: 6, seed: 17 };
const bytesOf = (a: Float32Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

describe('fitIalsThreaded', () => {
  it('gives bit-identical factors to the single-thread fit with the same seed', async () => {
    // Rows are solved independently given the other side, and Grams are summed over the same fixed
    // blocks in the same order, so splitting the rows across threads changes no floating-point operation.
    const m = randomInteractions(120, 70, 0.08, 5);
    const one = fitIals(m, params);
    for (const threads of [2, 3]) {
      const many = await fitIalsThreaded(m, params, { threads });
      expect(bytesOf(many.model.customerFactors).equals(bytesOf(one.model.customerFactors))).toBe(true);
      expect(bytesOf(many.model.itemFactors).equals(bytesOf(one.model.itemFactors))).toBe(true);
      // The observed part of the loss is summed per range, so only its rounding may differ.
      many.report.losses!.forEach((l, t) => expect(Math.abs(l - one.report.losses![t]!) / l).toBeLessThan(1e-12));
    }
  });

  it('gives identical losses too, the observed part being summed over fixed chunks in chunk order', async () => {
    const m = randomInteractions(300, 90, 0.05, 8);
    const one = fitIals(m, params);
    const many = await fitIalsThreaded(m, params, { threads: 2 });
    expect(many.report.losses).toEqual(one.report.losses);
    expect(bytesOf(many.model.itemFactors).equals(bytesOf(one.model.itemFactors))).toBe(true);
    // Every row chunk was solved by one of the two threads (dynamic claims; the split itself varies).
    expect(many.report.notes.join(' ')).toMatch(/solved on 2 threads \(shares of the row chunks: \d+% \/ \d+%\)/);
  });

  it('stops with CancelledError at an iteration boundary and releases its workers', async () => {
    const m = randomInteractions(60, 40, 0.1, 6);
    const ctl = new AbortController();
    const seen: number[] = [];
    const run = fitIalsThreaded(m, params, {
      threads: 2,
      signal: ctl.signal,
      onIteration: (p) => {
        seen.push(p.iteration);
        if (p.iteration === 3) ctl.abort();
      },
    });
    await expect(run).rejects.toBeInstanceOf(CancelledError);
    expect(seen).toEqual([1, 2, 3]);
  });
});
