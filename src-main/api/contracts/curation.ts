import { z } from 'zod';
import { TargetsShape } from '../../core/curation/target-schema.ts';
import { BriefRequestSchema, BriefSchema } from '../../core/editing/brief-schema.ts';
import { method } from '../define.ts';
import { ReasonView } from './reason.ts';

/**
 * Editions, shelves, editorial actions (with undo and redo), publish, compare, export, backtest and
 * forgetting a customer. Items are named by their external id; slots are 1-based, as editors count them.
 * Readings with no data (NaN in core) cross the boundary as null.
 */
const reading = z.number().nullable();
const label = (what: string) => z.string().trim().min(1, `name the ${what}`);
const shelfRef = { edition: label('edition'), shelf: label('shelf') };

/** Each reading on the scale, and under the name, of core/curation/readings.ts. */
export const ShelfMeterView = z.object({
  intraListDistance: reading,
  age: z.object({ medianDays: reading, meanDays: reading, newestDays: reading, oldestDays: reading, shareUnder30Days: reading }),
  /** Items per age bin (readings.ts AGE_BINS). */
  ageHistogram: z.array(z.number().int()),
  novelty: reading,
  noveltyBits: reading,
  promotedShareCount: reading,
  promotedShareExposure: reading,
  calibrationGap: reading,
  categoryMix: z.array(z.object({ category: z.string(), shelf: z.number(), audience: z.number() })),
  predictedRelevance: reading,
  /** Share of predicted relevance the brief's dials and rules give up against the most relevant list (0..1). */
  choiceCost: reading,
  saturation: z.array(reading),
  /** Slots flagged as saturated, counting from 1 as editors do. */
  saturatedSlots: z.array(z.number().int().min(1)),
});

export const EditionMeterView = z.object({
  distinctItems: z.number().int(),
  overlaps: z.array(z.object({ a: z.number().int(), b: z.number().int(), shared: z.number().int() })),
  supplierExposureGini: reading,
});

export const SlotView = z.object({
  slot: z.number().int().min(1),
  item: z.string().nullable(),
  title: z.string().nullable(),
  category: z.string().nullable(),
  supplier: z.string().nullable(),
  /** Promoted (paid): every screen and export labels it "Sponsored" in words. */
  promoted: z.boolean(),
  pinned: z.boolean(),
  score: reading,
  percentile: reading,
  /** Place by score among the pool's candidates (1 = best, ties share the best place); null outside the pool. */
  rank: z.number().int().min(1).nullable(),
  /** The main reason it was proposed, from the data; null when no part of its score has evidence to show. */
  reason: ReasonView.nullable(),
  contributions: z.record(z.string(), z.number()),
});

/** `title`: the rule in words with the brief's numbers ("At most 2 sponsored items (maxCount)"). */
export const ViolationView = z.object({ rule: z.string(), reason: z.string(), title: z.string() });

/** A brief as the api speaks it: anchors named by the shop's item ids (the store keeps row ids). */
const anchorIds = z.array(z.string().trim().min(1, 'name each anchor by its item id')).default([]);
export const ApiBrief = BriefSchema.extend({ anchors: anchorIds });

/**
 * A brief as a request carries it (core/editing/brief-schema.ts BriefRequestSchema: weights left out mean "set
 * the dials for this brief"), anchors named by item ids. This is the one parse of a brief on its way in.
 */
export const ApiBriefRequest = BriefRequestSchema.extend({ anchors: anchorIds });

const Named = { item: z.string(), title: z.string() };
export const ChangesView = z.object({
  entered: z.array(z.object({ ...Named, slot: z.number().int() })),
  left: z.array(z.object({ ...Named, slot: z.number().int(), why: z.string() })),
  moved: z.array(z.object({ ...Named, from: z.number().int(), to: z.number().int() })),
});
export type ChangesView = z.infer<typeof ChangesView>;

export const ShelfView = z.object({
  edition: z.string(),
  label: z.string(),
  position: z.number().int(),
  size: z.number().int(),
  locked: z.boolean(),
  brief: ApiBrief,
  slots: z.array(SlotView),
  meter: ShelfMeterView,
  violations: z.array(ViolationView),
  poolSize: z.number().int(),
  excluded: z.record(z.string(), z.number().int()),
  canUndo: z.boolean(),
  canRedo: z.boolean(),
  actions: z.array(
    z.object({ seq: z.number().int(), kind: z.string(), summary: z.string(), reason: z.string().nullable(), at: z.number(), undone: z.boolean() }),
  ),
  /** `reach`: the scope in words ("this edition and later, until 2026-03-31"). */
  bans: z.array(z.object({ item: z.string(), title: z.string(), scope: z.string(), reach: z.string() })),
  ruleBans: z.array(z.object({ facet: z.enum(['category', 'supplier', 'tag']), value: z.string(), scope: z.string(), reach: z.string() })),
  /** After a fill or an action: what changed against the list before (slots 1-based), for highlighting. */
  changes: ChangesView.optional(),
  /** Predicted relevance a full refill would have over the kept list (the meter's measure); null after Refill. */
  relevanceGivenUp: z.number().nullable().optional(),
});
export type ShelfView = z.infer<typeof ShelfView>;

const EditionSummary = z.object({
  id: z.number().int(),
  label: z.string(),
  date: z.string(),
  status: z.enum(['draft', 'published']),
  publishedAt: z.number().nullable(),
});

export const EditionView = EditionSummary.extend({ shelves: z.array(ShelfView), meter: EditionMeterView });
export type EditionView = z.infer<typeof EditionView>;

/** How far a ban reaches (core/editing/ban-scope.ts); an until date is checked against the edition's date. */
const Scope = z
  .string()
  .regex(/^(shelf|edition|later|always|until:\d{4}-\d{2}-\d{2})$/, 'must be shelf, edition, later, always or until:YYYY-MM-DD')
  .default('shelf');
const slotNo = z.number().int().min(1, 'slots count from 1');
const itemId = z.string().trim().min(1, 'name the item by its id');
const factor = z.number().positive('the factor must be above 0');

export const ShelfAction = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('pin'), slot: slotNo, item: itemId }).strict(),
  z.object({ kind: z.literal('unpin'), slot: slotNo }).strict(),
  z.object({ kind: z.literal('ban'), item: itemId, scope: Scope }).strict(),
  z.object({ kind: z.literal('banRule'), facet: z.enum(['category', 'supplier', 'tag']), value: z.string().min(1), scope: Scope }).strict(),
  /** Lift this shelf's ban on a category, supplier or tag. */
  z.object({ kind: z.literal('unbanRule'), facet: z.enum(['category', 'supplier', 'tag']), value: z.string().min(1) }).strict(),
  /** Multiply the item's score by `factor` (> 1 raises it). */
  z.object({ kind: z.literal('boost'), item: itemId, factor }).strict(),
  /** Divide the item's score by `factor` (> 1 lowers it). */
  z.object({ kind: z.literal('sink'), item: itemId, factor }).strict(),
  z.object({ kind: z.literal('lock') }).strict(),
  z.object({ kind: z.literal('unlock') }).strict(),
  z.object({ kind: z.literal('move'), from: slotNo, to: slotNo }).strict(),
  /** Lift this shelf's ban on an item. */
  z.object({ kind: z.literal('unban'), item: itemId }).strict(),
  /** Start the list over (undoable). */
  z.object({ kind: z.literal('refill') }).strict(),
  /** Fill from these anchors (item ids): the brief's anchors change and the list starts over (undoable). */
  z.object({ kind: z.literal('anchors'), anchors: z.array(itemId) }).strict(),
]);
export type ShelfAction = z.infer<typeof ShelfAction>;

export const ShelfDiffView = z.object({
  label: z.string(),
  presence: z.enum(['both', 'onlyA', 'onlyB']),
  added: z.array(z.string()),
  removed: z.array(z.string()),
  moved: z.array(z.object({ item: z.string(), from: z.number().int(), to: z.number().int() })),
});

export const BacktestView = z.object({
  windowDays: z.number(),
  windowStart: z.string(),
  windowEnd: z.string(),
  audienceActive: z.number().int(),
  shelf: z.object({ engaged: z.number().int(), share: reading, items: z.array(z.string()) }),
  popularity: z.object({ engaged: z.number().int(), share: reading, items: z.array(z.string()) }),
  notes: z.array(z.string()),
});

const LiftEntry = z.object({ value: z.string(), share: z.number(), lift: z.number() });
/** Taste groups as the editor sees them (services/curation/taste-groups.ts). */
const TasteGroupsView = z.object({
  k: z.number().int(),
  settings: z.object({ minK: z.number().int(), maxK: z.number().int(), minHistory: z.number().int() }),
  criterion: z.string(),
  tried: z.array(z.object({ k: z.number().int(), silhouette: z.number() })),
  silhouette: z.number(),
  sampled: z.number().int(),
  notEnoughHistory: z.number().int(),
  customers: z.number().int(),
  groups: z.array(
    z.object({
      group: z.number().int(),
      name: z.string().nullable(),
      nameOverlap: z.number(),
      customers: z.number().int(),
      signals: z.number().int(),
      cohesion: z.number(),
      nearest: z.number().int(),
      separation: z.number(),
      silhouette: z.number().nullable(),
      categories: z.array(LiftEntry),
      tags: z.array(LiftEntry),
      examples: z.array(z.object({ id: z.string(), title: z.string(), category: z.string() })),
    }),
  ),
  unmatchedNames: z.array(z.string()),
});

export const curationMethods = {
  'edition.new': method({
    summary: 'Start an edition on a date, optionally copying the shelves and briefs (not slots) of an earlier one.',
    request: z.object({ label: label('edition'), date: z.string(), from: z.string().optional() }).strict(),
    response: EditionView,
  }),
  'edition.list': method({
    summary: 'Every edition, oldest date first.',
    request: z.object({}).strict(),
    response: z.object({ editions: z.array(EditionSummary) }),
  }),
  'edition.show': method({
    summary: 'An edition with its shelves, their meters and the edition meter.',
    request: z.object({ edition: label('edition') }).strict(),
    response: EditionView,
  }),
  'edition.publish': method({
    summary: 'Freeze an edition into read-only history; its items then rest for the rest period.',
    request: z.object({ edition: label('edition') }).strict(),
    response: z.object({ edition: z.string(), publishedAt: z.number(), shelves: z.number().int(), items: z.number().int() }),
  }),
  'edition.compare': method({
    summary: 'Per shelf label, the items edition b added, removed and moved relative to edition a.',
    request: z.object({ a: label('first edition'), b: label('second edition') }).strict(),
    response: z.object({ a: z.string(), b: z.string(), shelves: z.array(ShelfDiffView), titles: z.record(z.string(), z.string()) }),
  }),
  'edition.export': method({
    summary: 'The edition as CSV, JSON or a standalone HTML preview (sponsored items labelled in words).',
    request: z.object({ edition: label('edition'), format: z.enum(['csv', 'json', 'html']) }).strict(),
    response: z.object({
      format: z.enum(['csv', 'json', 'html']),
      filename: z.string(),
      content: z.string(),
      /** A CSV is a bare table: its columns and the sponsored disclosure come as this separate text file. */
      notes: z.object({ filename: z.string(), content: z.string() }).nullable(),
    }),
  }),
  'catalogue.names': method({
    summary: 'The distinct categories, suppliers and tags of the catalogue, sorted: the names a brief, a limit or a ban may use.',
    request: z.object({}).strict(),
    response: z.object({ categories: z.array(z.string()), suppliers: z.array(z.string()), tags: z.array(z.string()) }),
  }),
  'shelf.add': method({
    summary: 'Add a shelf to a draft edition and fill it from its brief.',
    request: z.object({ edition: label('edition'), label: label('shelf'), brief: ApiBriefRequest }).strict(),
    response: ShelfView,
  }),
  'shelf.brief': method({
    summary: "Replace a shelf's brief (size, filters, quotas, promoted bounds, rest period...): an undoable action that keeps the list where the new brief allows.",
    request: z.object({ ...shelfRef, brief: ApiBriefRequest, reason: z.string().max(500).optional() }).strict(),
    response: ShelfView,
  }),
  'shelf.targets': method({
    summary: "Set the meter's target bands on a shelf's brief (readings left out keep their default band); the list is not filled again.",
    request: z.object({ ...shelfRef, targets: TargetsShape }).strict(),
    response: ShelfView,
  }),
  'shelf.fill': method({
    summary: 'Fill a shelf again from its brief and the editorial actions (a locked shelf stays as it is).',
    request: z.object(shelfRef).strict(),
    response: ShelfView,
  }),
  'shelf.show': method({
    summary: 'A shelf as last filled, with its meter and violations.',
    request: z.object(shelfRef).strict(),
    response: ShelfView,
  }),
  'shelf.act': method({
    summary: 'Apply one editorial action (pin, unpin, ban, banRule, boost, sink, lock, unlock, move) with an optional reason.',
    request: z.object({ ...shelfRef, action: ShelfAction, reason: z.string().max(500).optional() }).strict(),
    response: ShelfView,
  }),
  'shelf.undo': method({
    summary: "Undo the shelf's last editorial action.",
    request: z.object(shelfRef).strict(),
    response: ShelfView,
  }),
  'shelf.redo': method({
    summary: "Redo the shelf's last undone action.",
    request: z.object(shelfRef).strict(),
    response: ShelfView,
  }),
  'shelf.whatif': method({
    summary: 'For one slot, the best candidates not on the shelf and the change each would make to every meter reading.',
    request: z.object({ ...shelfRef, slot: slotNo, n: z.number().int().min(1).max(200).default(20) }).strict(),
    response: z.object({
      slot: z.number().int(),
      before: z.record(z.string(), reading),
      candidates: z.array(
        z.object({
          item: z.string(),
          title: z.string(),
          promoted: z.boolean(),
          percentile: z.number(),
          /** Place by score in the pool, 1 = best (ties share the best place). */
          rank: z.number().int().min(1),
          reason: ReasonView.nullable(),
          delta: z.record(z.string(), reading),
        }),
      ),
    }),
  }),
  'shelf.backtest': method({
    summary: "Share of the shelf's audience who engaged with its items in the most recent held-out window, beside a popularity-only list.",
    request: z.object({ ...shelfRef, windowDays: z.number().int().min(1).max(365).default(28) }).strict(),
    response: BacktestView,
  }),
  'customer.forget': method({
    summary: "Erase one customer's signals and row (and models holding per-customer rows, and their id in the import log), then rewrite the file so no bytes remain; reports what was erased.",
    request: z.object({ customer: z.string().trim().min(1, 'name the customer by its id') }).strict(),
    response: z.object({
      customer: z.string(),
      signals: z.number().int(),
      modelsDeleted: z.array(z.string()),
      modelsStale: z.array(z.string()),
      importLogScrubbed: z.number().int(),
      /** The file was rewritten and its log emptied; false while another program still reads the workspace. */
      bytesRemoved: z.boolean(),
      message: z.string(),
    }),
  }),
  'audience.groups': method({
    summary: 'The taste groups found in the iALS customer factors (unit vectors, k chosen by silhouette): size, cohesion, separation, name, top categories and tags by lift, example items.',
    request: z.object({}).strict(),
    response: TasteGroupsView,
  }),
  'audience.settings': method({
    summary: 'Change the range the number of taste groups is chosen in, and the distinct items a customer needs to join a group; answers the groups found with them.',
    request: z
      .object({
        minK: z.number().int().min(2).max(50).optional(),
        maxK: z.number().int().min(2).max(50).optional(),
        minHistory: z.number().int().min(1).max(1000).optional(),
      })
      .strict(),
    response: TasteGroupsView,
  }),
  'audience.name': method({
    summary: 'Name a taste group (the name follows its customers into later trainings while the group is still there), or remove a name.',
    request: z.union([
      z.object({ group: z.number().int().min(0), name: z.string().trim().min(1, 'give the group a name').max(60) }).strict(),
      z.object({ remove: z.string().trim().min(1, 'name the group name to remove') }).strict(),
    ]),
    response: TasteGroupsView,
  }),
};
