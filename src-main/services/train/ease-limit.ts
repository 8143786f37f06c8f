import os from 'node:os';

/**
 * How many items a training run's EASE fits by default: DESIGN.md's 20,000, or fewer when the memory
 * available now cannot hold EASE's one m × m float32 matrix (4m² bytes: 1.6 GB at 20,000; linalg/spd-f32.ts)
 * next to the rest of training. The budget keeps a quarter of the available memory and 512 MiB free
 * (common practice, no source). Above the limit fitEase keeps the most active items and says so.
 */
export const EASE_MAX_ITEMS = 20_000;

export function easeItemLimit(availableBytes: number = os.freemem()): { maxItems: number; note?: string } {
  const budget = availableBytes * 0.75 - 512 * 2 ** 20;
  const byMemory = budget > 0 ? Math.floor(Math.sqrt(budget / 4) / 500) * 500 : 0;
  if (byMemory >= EASE_MAX_ITEMS) return { maxItems: EASE_MAX_ITEMS };
  const maxItems = Math.max(500, byMemory);
  return {
    maxItems,
    note: `EASE item limit lowered from ${EASE_MAX_ITEMS} to ${maxItems}: ${(availableBytes / 2 ** 30).toFixed(1)} GiB of memory available (${maxItems} items need ${((4 * maxItems * maxItems) / 2 ** 30).toFixed(1)} GiB)`,
  };
}
