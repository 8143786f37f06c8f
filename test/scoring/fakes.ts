import type { Csr } from '../../src-main/core/matrix/csr.ts';
import type { ModelKind, Scorer, TopN } from '../../src-main/core/models/scorer.ts';

/** A Scorer over a dense symmetric similarity matrix; scoreInto sums similarity to the history items. */
export function matrixScorer(kind: ModelKind, sim: number[][]): Scorer {
  const n = sim.length;
  return {
    kind,
    itemCount: n,
    scoreInto(u: number, history: Csr, out: Float32Array) {
      out.fill(0);
      for (let p = history.indptr[u]!; p < history.indptr[u + 1]!; p++) {
        const h = history.indices[p]!;
        for (let j = 0; j < n; j++) if (j !== h) out[j]! += sim[h]![j]!;
      }
    },
    similarityInto(i: number, out: Float32Array) {
      out.set(sim[i]!);
      out[i] = 0;
    },
    similarItems(): TopN {
      throw new Error('not used');
    },
    serialize: () => new Uint8Array(0),
  };
}
