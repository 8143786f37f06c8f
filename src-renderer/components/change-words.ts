/**
 * What an action changed on a shelf, in the words an editor uses: the line the screen shows and the
 * live region reads out after every action (issue 12: highlight what changed, and say it).
 */
import type { ShelfChanges } from '../state/curation-slice.ts';

/** One sentence per kind of change; empty when the list is as it was. */
export function describeChanges(c: ShelfChanges): string[] {
  const out: string[] = [];
  if (c.entered.length > 0) out.push(`Added ${c.entered.map((e) => `${e.title} at slot ${e.slot}`).join(', ')}.`);
  if (c.left.length > 0) out.push(`Removed ${c.left.map((e) => `${e.title} from slot ${e.slot} (${e.why})`).join(', ')}.`);
  if (c.moved.length > 0) out.push(`Moved ${c.moved.map((e) => `${e.title}, slot ${e.from} → ${e.to}`).join('; ')}.`);
  return out;
}

/** Per item on the shelf, how the last change touched it (for the slot badges). */
export function changeMarks(c: ShelfChanges | null): Map<string, { kind: 'entered' } | { kind: 'moved'; from: number }> {
  const out = new Map<string, { kind: 'entered' } | { kind: 'moved'; from: number }>();
  for (const e of c?.entered ?? []) out.set(e.item, { kind: 'entered' });
  for (const m of c?.moved ?? []) out.set(m.item, { kind: 'moved', from: m.from });
  return out;
}
