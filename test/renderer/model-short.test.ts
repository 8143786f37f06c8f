import { describe, expect, it } from 'vitest';
import { modelShortWords } from '../../src-renderer/components/model-short.ts';
import { modelWords } from '../../src-main/core/models/model-words.ts';

describe("a chart axis's short model names", () => {
  const ids = ['content', 'itemknn', 'ials', 'ease', 'hybrid', 'popularity', 'random'];

  it('gives every model the evaluation reports a distinct name short enough for a bar group at 800 px', () => {
    const short = ids.map(modelShortWords);
    expect(new Set(short).size).toBe(ids.length);
    // Seven groups across a ~460 px chart leave ~65 px each: ten characters at the axis's 12 px (common practice, no source).
    for (const s of short) expect(s.length).toBeLessThanOrEqual(10);
    // Each is a known model's, not its id shown raw: the full name in the table says the same method.
    for (const id of ['itemknn', 'ials', 'ease']) expect(modelWords(id)).toContain(modelShortWords(id));
  });

  it('shows an unknown model by its id, as the table does', () => {
    expect(modelShortWords('fancy-new')).toBe('fancy-new');
    expect(modelWords('fancy-new')).toBe('fancy-new');
  });
});
