/**
 * A brief aimed at a taste group is stored by the group's name whenever the group has one: numbers are
 * given afresh at each training, names follow their members (core/audience/names.ts). So a brief given
 * as "group 2" while group 2 is named is kept as that name, and a brief given by name gets the number the
 * name carries now (kept only for reading; the fill resolves the name again).
 */
import type { Brief } from '../../core/curation/types.ts';
import { groupOf } from '../../core/scoring/index.ts';

export function aimByName(brief: Brief, names: readonly (string | null)[] | undefined): Brief {
  const a = brief.audience;
  if (a.kind !== 'group' || !names) return brief;
  if (a.name !== undefined) {
    const now = groupOf(a, names);
    // A name no group carries stays as given: the shelf then says it was not found, never using group N.
    return now < 0 || now === a.group ? brief : { ...brief, audience: { ...a, group: now } };
  }
  const name = names[a.group];
  return typeof name === 'string' ? { ...brief, audience: { ...a, name } } : brief;
}
