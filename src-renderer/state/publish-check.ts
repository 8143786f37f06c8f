import type { EditionView } from './curation-slice.ts';

export interface PublishCheck {
  /** Each rule a shelf does not meet now, as the fill reported it. */
  unmet: { shelf: string; rule: string; reason: string }[];
  /** Shelves nobody has looked at: never opened in the shelf editor here and without a single editorial action. */
  unopened: string[];
}

/** Key of a shelf the editor opened, recorded by the curation slice. */
export const shelfKey = (edition: string, shelf: string) => `${edition}\u0000${shelf}`;

/**
 * What to say before an edition is frozen. "Never opened" has two witnesses: the shelf editor of this window
 * (`opened`), and the shelf's action log, which outlives the window (any action, undone or not, means someone
 * worked on it). A shelf filled on its creation and never looked at again has neither.
 */
export function publishCheck(edition: EditionView, opened: readonly string[]): PublishCheck {
  const seen = new Set(opened);
  return {
    unmet: edition.shelves.flatMap((s) => s.violations.map((v) => ({ shelf: s.label, rule: v.rule, reason: v.reason }))),
    unopened: edition.shelves.filter((s) => s.actions.length === 0 && !seen.has(shelfKey(edition.label, s.label))).map((s) => s.label),
  };
}
