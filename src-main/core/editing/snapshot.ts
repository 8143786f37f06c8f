/**
 * What a published edition freezes (DESIGN.md "publish"), and the comparison of two editions.
 * Snapshots carry item ids, external ids and titles so history reads the same after the catalogue changes.
 */
import type { Brief, EditionMeter, RuleViolation, ShelfMeter } from '../curation/types.ts';

export interface SnapshotSlot {
  slot: number;
  itemId: number | null;
  externalId: string | null;
  title: string | null;
  category: string | null;
  supplier: string | null;
  promoted: boolean;
  pinned: boolean;
  score: number | null;
  percentile: number | null;
  /** Place by score in the shelf's pool when filled, 1 = best; absent in snapshots published before ranks were kept. */
  rank?: number | null;
}

export interface SnapshotShelf {
  label: string;
  position: number;
  brief: Brief;
  slots: SnapshotSlot[];
  meter: ShelfMeter | null;
  violations: RuleViolation[];
}

export interface EditionSnapshot {
  edition: { id: number; label: string; date: string };
  publishedAt: number;
  shelves: SnapshotShelf[];
  editionMeter: EditionMeter | null;
}

export interface ShelfDiff {
  label: string;
  /** in A only, in B only, or in both */
  presence: 'both' | 'onlyA' | 'onlyB';
  added: string[];
  removed: string[];
  /** Items on both, at different slots (1-based, as on screen). */
  moved: { item: string; from: number; to: number }[];
}

/** Items of a snapshot shelf as external id -> 0-based slot. */
function positions(s: SnapshotShelf | undefined): Map<string, number> {
  const m = new Map<string, number>();
  for (const x of s?.slots ?? []) if (x.externalId !== null) m.set(x.externalId, x.slot);
  return m;
}

/** Per shelf label (A's order, then B's new labels): what B added, removed and moved relative to A. */
export function compareEditions(a: EditionSnapshot, b: EditionSnapshot): ShelfDiff[] {
  const labels = [...a.shelves.map((s) => s.label)];
  for (const s of b.shelves) if (!labels.includes(s.label)) labels.push(s.label);
  return labels.map((label) => {
    const sa = a.shelves.find((s) => s.label === label);
    const sb = b.shelves.find((s) => s.label === label);
    const pa = positions(sa);
    const pb = positions(sb);
    const added = [...pb.keys()].filter((k) => !pa.has(k));
    const removed = [...pa.keys()].filter((k) => !pb.has(k));
    const moved: ShelfDiff['moved'] = [];
    for (const [k, from] of pa) {
      const to = pb.get(k);
      if (to !== undefined && to !== from) moved.push({ item: k, from: from + 1, to: to + 1 });
    }
    return { label, presence: sa && sb ? 'both' : sa ? 'onlyA' : 'onlyB', added, removed, moved };
  });
}

/** Title of every item on the given snapshots, by external id (comparisons read as titles, not codes). */
export function titlesOn(...snapshots: readonly EditionSnapshot[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const e of snapshots) for (const s of e.shelves) for (const x of s.slots) if (x.externalId !== null) out[x.externalId] = x.title ?? x.externalId;
  return out;
}

/** Workspace item ids on any shelf of the given snapshots (the rest period's resting set). */
export function itemsOn(snapshots: readonly EditionSnapshot[]): Set<number> {
  const out = new Set<number>();
  for (const e of snapshots) for (const s of e.shelves) for (const x of s.slots) if (x.itemId !== null) out.add(x.itemId);
  return out;
}
