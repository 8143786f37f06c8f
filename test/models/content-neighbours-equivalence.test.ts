/**
 * contentNeighbours skips features most items share when it searches for candidates (Bayardo, Ma & Srikant 2007,
 * "Scaling up all pairs similarity search", §4: a bound on what those features alone can add). The lists must be
 * those of the full inverted-index pass, which is kept below verbatim as the reference (core/models/content.ts at
 * c3abd73), bit for bit: same items, same order, same float32 similarities.
 */
import { describe, expect, it } from 'vitest';
import { transpose, type Csr } from '../../src-main/core/matrix/csr.ts';
import { contentNeighbours, contentVectors } from '../../src-main/core/models/content.ts';
import { collectNeighbours, type Neighbours } from '../../src-main/core/models/topn.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import type { Item } from '../../src-main/core/types.ts';

function referenceNeighbours(vectors: Csr, k: number): Neighbours {
  const ix = transpose(vectors);
  const acc = new Float32Array(vectors.rows);
  const touched = new Int32Array(vectors.rows);
  const seen = new Uint8Array(vectors.rows);
  return collectNeighbours(vectors.rows, k, (i, heap) => {
    let nTouched = 0;
    for (let p = vectors.indptr[i]!, e = vectors.indptr[i + 1]!; p < e; p++) {
      const a = vectors.data[p]!;
      for (let q = ix.indptr[vectors.indices[p]!]!, g = ix.indptr[vectors.indices[p]! + 1]!; q < g; q++) {
        const j = ix.indices[q]!;
        if (seen[j] === 0) {
          seen[j] = 1;
          touched[nTouched++] = j;
        }
        acc[j]! += a * ix.data[q]!;
      }
    }
    for (let t = 0; t < nTouched; t++) {
      const j = touched[t]!;
      if (j !== i && acc[j]! > 0) heap.push(j, acc[j]!);
      acc[j] = 0;
      seen[j] = 0;
    }
  });
}

/** Byte equality of typed arrays (a deep toEqual over a million entries is slow). */
const bytes = (a: Int32Array | Float32Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);
const same = (a: Neighbours, b: Neighbours) => {
  expect(a.indptr.length).toBe(b.indptr.length);
  expect(bytes(a.indptr).equals(bytes(b.indptr))).toBe(true);
  expect(bytes(a.indices).equals(bytes(b.indices))).toBe(true);
  expect(bytes(a.data).equals(bytes(b.data))).toBe(true);
};

/** Random l2-normalised rows: feature 0 in 97% of rows, features 1-3 in about a third each, the rest rare. */
function randomVectors(n: number, cols: number, seed: number): Csr {
  const rng = seededRng(seed);
  const indptr = new Int32Array(n + 1);
  const indices: number[] = [];
  const data: number[] = [];
  for (let i = 0; i < n; i++) {
    const f = new Set<number>();
    if (rng.next() < 0.97) f.add(0);
    for (let c = 1; c <= 3; c++) if (rng.next() < 0.33) f.add(c);
    const extra = rng.int(4);
    for (let e = 0; e < extra; e++) f.add(4 + rng.int(cols - 4));
    const row = [...f].sort((a, b) => a - b);
    const v = row.map(() => 0.05 + rng.next());
    const norm = Math.hypot(...v);
    indices.push(...row);
    data.push(...v.map((x) => (norm > 0 ? x / norm : 0)));
    indptr[i + 1] = indices.length;
  }
  return { rows: n, cols, indptr, indices: Int32Array.from(indices), data: Float32Array.from(data) };
}

describe('contentNeighbours with common features left out of the candidate search', () => {
  it('gives the full pass\'s lists bit for bit on rows sharing common features', () => {
    for (const [n, cols, k, seed] of [[1500, 400, 10, 1], [1100, 60, 50, 2], [1100, 30, 1200, 4]] as const) {
      const v = randomVectors(n, cols, seed);
      same(contentNeighbours(v, k), referenceNeighbours(v, k));
    }
  });

  it('gives the full pass\'s lists on a catalogue whose titles all share a word and whose categories are large', () => {
    const items = Array.from({ length: 3000 }, (_, i) => ({
      id: i + 1,
      externalId: `i${i}`,
      title: `Item ${i} ${i % 7 === 0 ? 'blue' : 'red'}`,
      description: '',
      category: `c${i % 4}`,
      tags: [],
      supplier: `s${(i * 7919) % 300}`,
      price: null,
      addedAt: null,
      promoted: false,
      available: true,
      attributes: {},
    })) as Item[];
    const { vectors } = contentVectors(items, {});
    same(contentNeighbours(vectors, 50), referenceNeighbours(vectors, 50));
  });
});
