/**
 * An action as the editor's log names it: verb, item, slots and factor ("Sank Oak Houseplant Mix ×0.5,
 * slot 2 → 6"). Slots come from the lists the action recorded for this shelf (1-based, as on screen).
 */
import { scopeWords, type EditRecord } from '../../core/editing/index.ts';
import { briefChangeWords } from '../../core/curation/brief-words.ts';

const factorWords = (f: number) => `×${Number(f.toPrecision(3))}`;

export function describeAction(record: EditRecord, shelfId: number, title: (itemId: number) => string): string {
  const a = record.action;
  const lists = record.lists?.[String(shelfId)];
  const at = (list: readonly (number | null)[] | undefined, id: number) => {
    const k = list?.indexOf(id) ?? -1;
    return k < 0 ? null : k + 1;
  };
  const entered = lists ? lists.after.filter((id): id is number => id !== null && !lists.before.includes(id)) : [];
  const left = lists ? lists.before.filter((id): id is number => id !== null && !lists.after.includes(id)) : [];
  /** Who else came in and went out: "; Lamp came in; Rug left". */
  const cameIn = (skip: number) => {
    const inNames = entered.filter((id) => id !== skip).map(title);
    const outNames = left.filter((id) => id !== skip).map(title);
    return `${inNames.length ? `; ${inNames.join(', ')} came in` : ''}${outNames.length ? `; ${outNames.join(', ')} left` : ''}`;
  };
  /** "slot 2 → 6", "stays at slot 3", "came in at slot 4" or "" when the shelf list was not touched. */
  const slots = (id: number) => {
    const from = at(lists?.before, id);
    const to = at(lists?.after, id);
    if (!lists) return '';
    if (from !== null && to !== null) return from === to ? `, stays at slot ${to}` : `, slot ${from} → ${to}`;
    if (to !== null) return `, came in at slot ${to}`;
    if (from !== null) return `, left slot ${from}`;
    return '';
  };
  switch (a.kind) {
    case 'pin': {
      const from = at(lists?.before, a.item);
      const where = !lists ? '' : from === null ? ' (new on the shelf)' : from !== a.slot + 1 ? ` (was slot ${from})` : '';
      return `Pinned ${title(a.item)} to slot ${a.slot + 1}${where}${cameIn(a.item)}`;
    }
    case 'unpin': {
      const was = record.before.pins[String(a.slot)];
      return was === null || was === undefined ? `Unpinned slot ${a.slot + 1}` : `Unpinned ${title(was)} at slot ${a.slot + 1}`;
    }
    case 'ban':
      return `Banned ${title(a.item)} (${scopeWords(a.scope)})${slots(a.item)}${cameIn(a.item)}`;
    case 'banRule':
      return `Banned ${a.facet} ${a.value} (${scopeWords(a.scope)})${cameIn(-1)}`;
    case 'unbanRule':
      return `Lifted the ban on ${a.facet} ${a.value}${cameIn(-1)}`;
    case 'carry': {
      const n = Object.keys(a.bans).length + Object.keys(a.banRules).length;
      const names = [...Object.keys(a.bans).map((id) => title(Number(id))), ...Object.values(a.banRules).map((r) => `${r.facet} ${r.value}`)];
      return `Carried ${n} ban${n === 1 ? '' : 's'} from ${a.from}: ${names.join(', ')}`;
    }
    case 'brief':
      return `Changed the brief: ${briefChangeWords(a.was, a.brief)}${cameIn(-1)}`;
    case 'boost':
      return `${a.factor >= 1 ? 'Boosted' : 'Sank'} ${title(a.item)} ${factorWords(a.factor)}${slots(a.item)}${cameIn(a.item)}`;
    case 'lock':
      return 'Locked the shelf';
    case 'unlock':
      return 'Unlocked the shelf';
    case 'move': {
      const other = record.before.pins[String(a.to)];
      const swap = other !== null && other !== undefined && other !== a.item ? `; pinned ${title(other)} swapped to slot ${a.from + 1}` : '';
      return `Moved ${title(a.item)}, slot ${a.from + 1} → ${a.to + 1} (pinned there)${swap}`;
    }
    case 'unban':
      return `Lifted the ban on ${title(a.item)}${cameIn(-1)}`;
    case 'refill':
      return `Refilled the shelf${lists ? `: ${entered.length} new item${entered.length === 1 ? '' : 's'}` : ': no change'}`;
    case 'anchors':
      return a.anchors.length === 0
        ? 'Cleared the anchors and refilled'
        : `Filled from ${a.anchors.length} anchor${a.anchors.length === 1 ? '' : 's'}: ${a.anchors.map(title).join(', ')}`;
  }
}
