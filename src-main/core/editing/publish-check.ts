/**
 * What to say before an edition is frozen, for the app's confirmation and the command line's alike:
 * every rule a shelf does not meet now (in words), and the shelves nobody has looked at.
 */

export interface PublishCheck {
  /** Each rule a shelf does not meet now, as the fill reported it; `title` is the rule in words. */
  unmet: { shelf: string; rule: string; title: string; reason: string }[];
  /** Shelves nobody has looked at: never opened in a shelf editor (when one is known) and without an action. */
  unopened: string[];
}

/** The parts of an edition the check reads (the api's edition view has them). */
export interface CheckedEdition {
  label: string;
  shelves: { label: string; violations: { rule: string; reason: string; title?: string }[]; actions: readonly unknown[] }[];
}

/** Key of a shelf an editor opened (the app records them per window). */
export const shelfKey = (edition: string, shelf: string) => `${edition}\u0000${shelf}`;

/**
 * "Never opened" has two witnesses: a shelf editor's record of opened shelves (`opened`, the app's window;
 * the command line has none), and the shelf's action log, which outlives any window (any action, undone or
 * not, means someone worked on it). A shelf filled on its creation and never looked at again has neither.
 */
export function publishCheck(edition: CheckedEdition, opened: readonly string[] = []): PublishCheck {
  const seen = new Set(opened);
  return {
    unmet: edition.shelves.flatMap((s) =>
      s.violations.map((v) => ({ shelf: s.label, rule: v.rule, title: v.title ?? v.rule, reason: v.reason })),
    ),
    unopened: edition.shelves.filter((s) => s.actions.length === 0 && !seen.has(shelfKey(edition.label, s.label))).map((s) => s.label),
  };
}

/** The check as lines of text (the command line prints these before it asks). */
export function publishCheckLines(c: PublishCheck): string[] {
  const out: string[] = [];
  if (c.unmet.length === 0) out.push('Every shelf meets its rules.');
  else {
    out.push(`${c.unmet.length} rule${c.unmet.length === 1 ? ' is' : 's are'} not met:`);
    for (const u of c.unmet) out.push(`  ${u.shelf} — ${u.title}: ${u.reason}`);
  }
  if (c.unopened.length === 0) out.push('Every shelf has had an editorial action.');
  else out.push(`${c.unopened.length === 1 ? 'One shelf was' : `${c.unopened.length} shelves were`} never opened (no action on it): ${c.unopened.join(', ')}`);
  return out;
}
