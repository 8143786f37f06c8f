import { describe, expect, it } from 'vitest';
import { EASE_MAX_ITEMS, easeItemLimit } from '../../src-main/services/train/ease-limit.ts';

describe('easeItemLimit', () => {
  it('is the design limit of 20,000 items when memory holds the 1.6 GB float32 matrix with room to spare', () => {
    expect(easeItemLimit(16 * 2 ** 30)).toEqual({ maxItems: EASE_MAX_ITEMS });
  });

  it('is lowered, and says why, when the available memory cannot hold 4·m² bytes within its budget', () => {
    const available = 2 * 2 ** 30;
    const { maxItems, note } = easeItemLimit(available);
    expect(maxItems).toBeLessThan(EASE_MAX_ITEMS);
    // The matrix fits the budget (three quarters of what is available, less 512 MiB) and 500 more items would not.
    const budget = available * 0.75 - 512 * 2 ** 20;
    expect(4 * maxItems ** 2).toBeLessThanOrEqual(budget);
    expect(4 * (maxItems + 500) ** 2).toBeGreaterThan(budget);
    expect(note).toMatch(/lowered from 20000 to \d+: 2\.0 GiB of memory available/);
  });
});
