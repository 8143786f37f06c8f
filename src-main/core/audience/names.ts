/**
 * Carrying an editor's group names across trainings. Groups are found afresh each time and numbered by
 * size, so a name is kept with the customers its group held when named, and goes to the new group whose
 * members overlap them most, by the Jaccard index |A ∩ B| / |A ∪ B| (Jaccard 1912). Pairs are taken best
 * first, each name and group used once, and only at Jaccard ≥ `minOverlap` (default 0.5: more shared than
 * not; common practice, no source), so a group that split or dissolved loses its name rather than passing
 * it to a stranger.
 */
export interface NamedSet {
  name: string;
  /** Dense customer indices. */
  members: ArrayLike<number>;
}

export interface NameMatch {
  /** Name of each group, or null. */
  names: (string | null)[];
  /** Jaccard index of each group with its name's members (0 when unnamed). */
  overlap: number[];
  /** Names whose group is no longer there. */
  unmatched: string[];
}

export function matchNames(assignment: Int32Array, k: number, named: readonly NamedSet[], minOverlap = 0.5): NameMatch {
  const sizes = new Int32Array(k);
  for (const g of assignment) if (g >= 0 && g < k) sizes[g]!++;
  const candidates: { n: number; g: number; j: number }[] = [];
  named.forEach((set, n) => {
    const inter = new Int32Array(k);
    let size = 0;
    for (let i = 0; i < set.members.length; i++) {
      const u = set.members[i] as number;
      size++;
      const g = u >= 0 && u < assignment.length ? (assignment[u] as number) : -1;
      if (g >= 0 && g < k) inter[g]!++;
    }
    for (let g = 0; g < k; g++) {
      const union = size + (sizes[g] as number) - (inter[g] as number);
      const j = union === 0 ? 0 : (inter[g] as number) / union;
      if (j >= minOverlap) candidates.push({ n, g, j });
    }
  });
  candidates.sort((a, b) => b.j - a.j || a.g - b.g || a.n - b.n);
  const names: (string | null)[] = Array.from({ length: k }, () => null);
  const overlap = Array.from({ length: k }, () => 0);
  const used = new Set<number>();
  for (const c of candidates) {
    if (used.has(c.n) || names[c.g] !== null) continue;
    used.add(c.n);
    names[c.g] = named[c.n]!.name;
    overlap[c.g] = c.j;
  }
  return { names, overlap, unmatched: named.filter((_, n) => !used.has(n)).map((s) => s.name) };
}
