import { describe, expect, it } from 'vitest';
import { fitTfidf } from '../../src-main/core/text/tfidf.ts';

/** Row d of the result as a term → weight map. */
function row(t: ReturnType<typeof fitTfidf>, d: number): Record<string, number> {
  const m = t.matrix;
  const out: Record<string, number> = {};
  for (let p = m.indptr[d]!; p < m.indptr[d + 1]!; p++) out[t.vocabulary[m.indices[p]!]!] = m.data[p]!;
  return out;
}

describe('fitTfidf', () => {
  /*
   * Worked by hand from the formula of the scikit-learn TfidfVectorizer / TfidfTransformer documentation,
   * smooth_idf=True, norm='l2' (raw counts as tf, idf = ln((1 + n) / (1 + df)) + 1, rows l2-normalised).
   *   d0 = apple banana apple, d1 = banana cherry, d2 = cherry date date banana;  n = 3
   *   df: apple 1, banana 3, cherry 2, date 1
   *   idf: apple = date = ln(4/2) + 1 = 1.6931471805599454; banana = ln(4/4) + 1 = 1;
   *        cherry = ln(4/3) + 1 = 1.2876820724517808
   *   d0 raw: apple 2 · 1.69314718 = 3.386294361119891, banana 1; ‖·‖ = √(3.386294361119891² + 1) = 3.5308624300802727
   *       → apple 0.95905587605771, banana 0.2832169249871526
   *   d1 raw: banana 1, cherry 1.2876820724517808; ‖·‖ = 1.6303757602815718
   *       → banana 0.6133555370249717, cherry 0.7898069290660905
   *   d2 raw: banana 1, cherry 1.2876820724517808, date 3.386294361119891; ‖·‖ = 3.7583393433624486
   *       → banana 0.2660749625405929, cherry 0.3426199591918006, date 0.901008145286396
   */
  const t = fitTfidf([
    ['apple', 'banana', 'apple'],
    ['banana', 'cherry'],
    ['cherry', 'date', 'date', 'banana'],
  ]);

  it('sorts the vocabulary and computes smooth idf by the documented formula', () => {
    expect(t.vocabulary).toEqual(['apple', 'banana', 'cherry', 'date']);
    const expected = [1.6931471805599454, 1, 1.2876820724517808, 1.6931471805599454];
    expected.forEach((v, c) => expect(Math.abs(t.idf[c]! - v)).toBeLessThan(1e-9));
  });

  it('gives the hand-worked l2-normalised weights to 1e-9', () => {
    const expected = [
      { apple: 0.95905587605771, banana: 0.2832169249871526 },
      { banana: 0.6133555370249717, cherry: 0.7898069290660905 },
      { banana: 0.2660749625405929, cherry: 0.3426199591918006, date: 0.901008145286396 },
    ];
    expected.forEach((e, d) => {
      const r = row(t, d);
      expect(Object.keys(r)).toEqual(Object.keys(e).sort());
      for (const [term, v] of Object.entries(e)) expect(Math.abs(r[term]! - v)).toBeLessThan(1e-9);
    });
  });

  it('reproduces the first row of the smooth_idf example in the scikit-learn user guide (values from memory)', () => {
    // User guide, "Tf–idf term weighting": counts [[3,0,1],[2,0,0],[3,0,0],[4,0,0],[3,2,0],[3,0,2]] give
    // first row [0.85151335, 0., 0.52433293] with smooth_idf=True. By the formula: idf(t1) = ln(7/7)+1 = 1,
    // idf(t3) = ln(7/3)+1; (3, 1.8472978603872037) / 3.5232... = (0.8515133..., 0.5243329...).
    const counts = [
      [3, 0, 1],
      [2, 0, 0],
      [3, 0, 0],
      [4, 0, 0],
      [3, 2, 0],
      [3, 0, 2],
    ];
    const docs = counts.map((c) => c.flatMap((k, term) => Array<string>(k).fill(`t${term + 1}`)));
    const r = row(fitTfidf(docs), 0);
    expect(r['t1']).toBeCloseTo(0.85151335, 8);
    expect(r['t2']).toBeUndefined();
    expect(r['t3']).toBeCloseTo(0.52433293, 8);
  });

  it('leaves an empty document as an empty row and honours minDf', () => {
    const u = fitTfidf([['alpha', 'beta'], [], ['alpha']], { minDf: 2 });
    expect(u.vocabulary).toEqual(['alpha']);
    expect(row(u, 1)).toEqual({});
    expect(row(u, 0)).toEqual({ alpha: 1 });
    expect(() => fitTfidf([], { minDf: 0 })).toThrow(/minDf/);
  });
});
