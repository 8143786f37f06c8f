/**
 * Adjusted Rand index (Hubert & Arabie 1985, "Comparing partitions", J. Classification 2:193-218):
 * agreement between two labellings of the same points, corrected for chance so that random labellings
 * score about 0 and identical partitions (up to renaming) score 1. With n_ij the contingency table,
 * a_i and b_j its row and column sums and C(m) = m(m−1)/2:
 *   ARI = (Σ C(n_ij) − E) / (½(Σ C(a_i) + Σ C(b_j)) − E),  E = Σ C(a_i) · Σ C(b_j) / C(n).
 * Labels are any integers; points whose label is negative in either labelling are left out.
 */
import { InputError } from '../errors.ts';

const pairs = (m: number): number => (m * (m - 1)) / 2;

export function adjustedRandIndex(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) throw new InputError(`adjusted Rand index: labellings differ in length (${a.length} vs ${b.length})`);
  const cells = new Map<string, number>();
  const rows = new Map<number, number>();
  const cols = new Map<number, number>();
  let n = 0;
  for (let i = 0; i < a.length; i++) {
    const x = a[i] as number;
    const y = b[i] as number;
    if (x < 0 || y < 0) continue;
    n++;
    const key = `${x},${y}`;
    cells.set(key, (cells.get(key) ?? 0) + 1);
    rows.set(x, (rows.get(x) ?? 0) + 1);
    cols.set(y, (cols.get(y) ?? 0) + 1);
  }
  let index = 0;
  for (const v of cells.values()) index += pairs(v);
  let sa = 0;
  for (const v of rows.values()) sa += pairs(v);
  let sb = 0;
  for (const v of cols.values()) sb += pairs(v);
  const expected = n < 2 ? 0 : (sa * sb) / pairs(n);
  const max = (sa + sb) / 2;
  // Both labellings put everything in one group (or every point alone): identical partitions, as scikit-learn says.
  if (max === expected) return 1;
  return (index - expected) / (max - expected);
}
