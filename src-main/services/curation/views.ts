/**
 * What the api returns for a shelf and an edition: slots with the item's title, category, supplier and
 * sponsored flag, percentile score and component contributions, plus the meter and the violations. The
 * renderer's shelf editor is built from exactly this. Slots here are 1-based, as editors count them.
 */
import type { EditionMeter, RuleViolation, ShelfMeter } from '../../core/curation/types.ts';
import type { Brief } from '../../core/curation/types.ts';
import type { ListChanges } from '../../core/curation/stable-fill.ts';
import { ruleWords } from '../../core/curation/rule-words.ts';
import { scopeWords, type BanScope, type ShelfEdits } from '../../core/editing/index.ts';
import type { Item } from '../../core/types.ts';
import type { Edition } from '../../store/editions.ts';
import type { ActionEntry } from '../../store/editorial-actions.ts';
import type { Shelf, SlotRow } from '../../store/shelves.ts';
import { describeAction } from './action-words.ts';
import type { FilledShelf } from './shelf-fill.ts';
import type { SlotExplanation } from './slot-reasons.ts';
import type { Reason } from '../../core/curation/reasons.ts';

export interface SlotView {
  /** 1-based position on the shelf. */
  slot: number;
  item: string | null;
  title: string | null;
  category: string | null;
  supplier: string | null;
  /** A promoted (paid) item, shown and exported as "Sponsored". */
  promoted: boolean;
  pinned: boolean;
  score: number | null;
  percentile: number | null;
  /** Place by score among the pool's candidates, 1 = best; null when the item is not in the pool. */
  rank: number | null;
  /** The main reason it was proposed, from the data (core/curation/reasons.ts); null when none shows. */
  reason: Reason | null;
  contributions: Record<string, number>;
}

export interface ActionView {
  seq: number;
  kind: string;
  /** Verb, item, slots and factor, e.g. "Sank Oak Houseplant Mix ×0.5, slot 2 → 6". */
  summary: string;
  reason: string | null;
  at: number;
  undone: boolean;
}

export interface ShelfView {
  edition: string;
  label: string;
  position: number;
  size: number;
  locked: boolean;
  brief: Brief;
  slots: SlotView[];
  meter: ShelfMeter;
  /** `title`: the rule in words with the brief's numbers (core/curation/rule-words.ts). */
  violations: (RuleViolation & { title: string })[];
  poolSize: number;
  excluded: Record<string, number>;
  canUndo: boolean;
  canRedo: boolean;
  actions: ActionView[];
  /** This shelf's own bans on items, each with its reach; the editor can lift each one. */
  bans: { item: string; title: string; scope: BanScope; reach: string }[];
  /** This shelf's own bans on every item of a category, supplier or tag, each with its reach. */
  ruleBans: { facet: 'category' | 'supplier' | 'tag'; value: string; scope: BanScope; reach: string }[];
  /** After a fill or an action: what changed against the list before (slots 1-based). */
  changes?: ChangesView;
  /** Predicted relevance (the meter's) a full refill would have over the kept list; null after a refill. */
  relevanceGivenUp?: number | null;
}

export interface ChangedItem {
  item: string;
  title: string;
}

export interface ChangesView {
  entered: (ChangedItem & { slot: number })[];
  left: (ChangedItem & { slot: number; why: string })[];
  moved: (ChangedItem & { from: number; to: number })[];
}

/** A fill's list changes in the editor's terms: external ids, titles, 1-based slots. */
/** `why` names rules in words when the brief is given (rule-words.ts); edits ('banned', ...) as they are. */
export function changesView(c: ListChanges, itemAt: (dense: number) => Item | undefined, brief?: Brief): ChangesView {
  const why = (w: string) => (brief ? w.split(', ').map((r) => ruleWords(r, brief)).join(', ') : w);
  const named = (i: number): ChangedItem => {
    const it = itemAt(i);
    return { item: it?.externalId ?? String(i), title: it?.title ?? it?.externalId ?? String(i) };
  };
  return {
    entered: c.entered.map((e) => ({ ...named(e.item), slot: e.slot + 1 })),
    left: c.left.map((e) => ({ ...named(e.item), slot: e.slot + 1, why: why(e.why) })),
    moved: c.moved.map((e) => ({ ...named(e.item), from: e.from + 1, to: e.to + 1 })),
  };
}

export interface EditionView {
  id: number;
  label: string;
  date: string;
  status: 'draft' | 'published';
  publishedAt: number | null;
  shelves: ShelfView[];
  meter: EditionMeter;
}

export function slotView(s: SlotRow, item: Item | undefined, why?: SlotExplanation): SlotView {
  return {
    slot: s.slot + 1,
    item: item?.externalId ?? null,
    title: item?.title ?? null,
    category: item?.category ?? null,
    supplier: item?.supplier ?? null,
    promoted: item?.promoted ?? false,
    pinned: s.pinned,
    score: s.score,
    percentile: s.percentile,
    rank: s.itemId === null ? null : (why?.rank ?? null),
    reason: s.itemId === null ? null : (why?.reason ?? null),
    contributions: s.contributions,
  };
}

/** The shelf's action log as the editor reads it, each action named in words (action-words.ts). */
export function actionViews(entries: readonly ActionEntry[], shelfId: number, itemById: (id: number) => Item | undefined): ActionView[] {
  const title = (id: number) => itemById(id)?.title ?? itemById(id)?.externalId ?? `item ${id}`;
  return entries.map((e) => ({ seq: e.seq, kind: e.kind, summary: describeAction(e.record, shelfId, title), reason: e.reason, at: e.at, undone: e.undone }));
}

export function shelfView(
  edition: Edition,
  shelf: Shelf,
  filled: FilledShelf,
  itemById: (id: number) => Item | undefined,
  entries: readonly ActionEntry[],
  edits: Pick<ShelfEdits, 'bans' | 'banRules'> = { bans: {}, banRules: {} },
): ShelfView {
  const title = (id: number) => itemById(id)?.title ?? itemById(id)?.externalId ?? `item ${id}`;
  const cursor = entries.filter((e) => !e.undone).length;
  return {
    edition: edition.label,
    label: shelf.label,
    position: shelf.position + 1,
    size: shelf.size,
    locked: shelf.locked,
    brief: shelf.brief,
    slots: filled.slots.map((s) => slotView(s, s.itemId === null ? undefined : itemById(s.itemId), filled.explanations[s.slot])),
    // Saturated slots counted from 1, as the slots above and the editors count them (issue 12: "Slots 0").
    meter: { ...filled.meter, saturatedSlots: filled.meter.saturatedSlots.map((s) => s + 1) },
    violations: filled.violations.map((v) => ({ ...v, title: ruleWords(v.rule, shelf.brief) })),
    poolSize: filled.poolSize,
    excluded: filled.excluded,
    canUndo: cursor > 0,
    canRedo: cursor < entries.length,
    actions: actionViews(entries, shelf.id, itemById),
    bans: Object.entries(edits.bans).map(([id, scope]) => ({
      item: itemById(Number(id))?.externalId ?? id,
      title: title(Number(id)),
      scope,
      reach: scopeWords(scope),
    })),
    ruleBans: Object.values(edits.banRules).map((r) => ({ facet: r.facet, value: r.value, scope: r.scope, reach: scopeWords(r.scope) })),
  };
}
