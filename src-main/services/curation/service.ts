/**
 * The curation use cases: editions, shelves, editorial actions with undo and redo, publish and compare.
 * Every write is one transaction: the log entry, the materialised bans and boosts, the lock flag and the
 * re-filled slots commit together or not at all (better-sqlite3 docs/api.md, .transaction).
 */
import { meterEdition } from '../../core/curation/edition-meter.ts';
import type { EditionMeter, RuleViolation } from '../../core/curation/types.ts';
import { isDeepStrictEqual } from 'node:util';
import { InputError, NotFoundError } from '../../core/errors.ts';
import {
  carriesTo,
  checkAction,
  checkScope,
  editionWide,
  ruleKey,
  compareEditions,
  titlesOn,
  doAction,
  redo as redoLog,
  replay,
  undo as undoLog,
  emptyEdits,
  type EditAction,
  type EditRecord,
  type Edited,
  type ListAround,
  type EditionSnapshot,
  type ShelfDiff,
  type ShelfEdits,
} from '../../core/editing/index.ts';
import { parseBrief, withDefaultWeights, type BriefRequest } from '../../core/editing/brief-schema.ts';
import { catalogueNames, checkBriefNames, checkName, type CatalogueNames } from '../../core/curation/brief-names.ts';
import { targetProblem, type LooseTargets } from '../../core/curation/readings.ts';
import type { Item } from '../../core/types.ts';
import type { EditionRepo, Edition } from '../../store/editions.ts';
import type { EditorialRepo } from '../../store/editorial-actions.ts';
import type { ItemRepo } from '../../store/items.ts';
import type { ShelfRepo, Shelf } from '../../store/shelves.ts';
import type { Db } from '../../store/workspace.ts';
import { aimByName } from './group-aim.ts';
import { dialsFor } from './brief-dials.ts';
import { dateMs } from '../../store/editions.ts';
import { curationRepos } from './repos.ts';
import { fillAndMeter, frozenDense, readShelf, type FilledShelf, type FillMode } from './shelf-fill.ts';
import { listChanges, type ListChanges } from '../../core/curation/stable-fill.ts';
import { editionSnapshot, publishEdition } from './publish.ts';
import { actionViews, changesView, shelfView, type EditionView, type ShelfView } from './views.ts';
import { shelfWhatIf, type WhatIfView } from './whatif.ts';
import { loadWorld, noModels, type CurationWorld, type ModelSource } from './world.ts';

/** An action as the editor names it: items by external id, slots 1-based. */
export type ActionRequest =
  | { kind: 'pin'; slot: number; item: string }
  | { kind: 'unpin'; slot: number }
  /** `scope`: shelf, edition, later, always or until:YYYY-MM-DD (core/editing/ban-scope.ts). */
  | { kind: 'ban'; item: string; scope: string }
  | { kind: 'banRule'; facet: 'category' | 'supplier' | 'tag'; value: string; scope: string }
  | { kind: 'unbanRule'; facet: 'category' | 'supplier' | 'tag'; value: string }
  | { kind: 'boost'; item: string; factor: number }
  | { kind: 'lock' }
  | { kind: 'unlock' }
  | { kind: 'move'; from: number; to: number }
  | { kind: 'unban'; item: string }
  | { kind: 'refill' }
  | { kind: 'anchors'; anchors: number[] };

/** How #refillEdition fills: the target afresh, or every shelf stably (with the lists an undo restores). */
interface RefillHow {
  start: 'over' | 'stable';
  rescored?: { item: number; direction: 'up' | 'down' };
  restore?: Record<string, ListAround>;
}

function sameList(a: readonly (number | null)[], b: readonly (number | null)[]): boolean {
  return a.length === b.length && a.every((x, k) => x === b[k]);
}

export class CurationService {
  readonly db: Db;
  readonly #source: ModelSource;
  readonly clock: () => number;
  readonly editions: EditionRepo;
  readonly shelves: ShelfRepo;
  readonly editorial: EditorialRepo;
  readonly items: ItemRepo;

  constructor(db: Db, source: ModelSource = noModels, clock: () => number = Date.now) {
    this.db = db;
    this.#source = source;
    this.clock = clock;
    ({ editions: this.editions, shelves: this.shelves, editorial: this.editorial, items: this.items } = curationRepos(db));
  }

  world(): CurationWorld {
    return loadWorld(this.db, this.#source);
  }

  #item = (world: CurationWorld) => (id: number): Item | undefined => {
    const i = world.ctx.indexOfId.get(id);
    return i === undefined ? undefined : world.ds.items[i];
  };

  #draft(label: string): Edition {
    const e = this.editions.byLabel(label);
    if (e.status === 'published') throw new InputError(`edition '${label}' is published and read-only; start a new edition from it`);
    return e;
  }

  #edits(shelf: Shelf): ShelfEdits {
    return replay(emptyEdits(), this.editorial.log(shelf.id));
  }

  /** Reads a shelf as stored, with its meter (no fill). */
  #read(world: CurationWorld, edition: Edition, shelf: Shelf): ShelfView {
    return this.#readFilled(world, edition, shelf).view;
  }

  /** A shelf as stored, read once: the slots and meter (`filled`) and the view built from exactly those. */
  #readFilled(world: CurationWorld, edition: Edition, shelf: Shelf): { filled: FilledShelf; view: ShelfView } {
    const edits = this.#edits(shelf);
    const filled = fillAndMeter(world, shelf, edition, readShelf(this.db, shelf, edition), edits, false);
    return { filled, view: shelfView(edition, shelf, filled, this.#item(world), this.editorial.entries(shelf.id), edits) };
  }

  /**
   * Fills the shelves of the edition again, in position order, and stores them; returns the view of the
   * shelf `targetId` and the lists that changed. A shelf's fill depends on the others (an item runs once
   * per edition; edition-wide bans), so the edition is one unit: each shelf leaves out the items of the
   * shelves before it and of every locked shelf.
   *
   * `how.start` 'over' fills the target afresh (Refill, a new shelf or brief); 'stable' keeps every
   * shelf's current list and changes only what the edits or the rules force (core/curation/stable-fill.ts),
   * so a list depends on the lists before it: `how.restore` (undo) puts back the lists an action recorded,
   * each only where the shelf still holds the list the action left, and as it was when it is still
   * admissible. The returned `lists` are what an action records for that.
   *
   * `reach` 'all' fills every shelf (edition-wide bans, lock and unlock touch every shelf). 'fromTarget'
   * keeps the shelves before the target, fills the target, and fills a later shelf only once an earlier
   * shelf's set of items changed (its inputs are otherwise unchanged). Inside the caller's transaction.
   */
  #refillEdition(
    world: CurationWorld,
    edition: Edition,
    targetId: number,
    reach: 'all' | 'fromTarget' = 'all',
    how: RefillHow = { start: 'stable' },
  ): { view: ShelfView; lists: Record<string, ListAround> } {
    const shelves = this.shelves.list(edition.id);
    const edits = new Map(shelves.map((s) => [s.id, this.#edits(s)]));
    const frozen = new Map<number, Int32Array>();
    for (const s of shelves) {
      const ed = edits.get(s.id)!;
      if (ed.locked) frozen.set(s.id, frozenDense(world, s, ed));
    }
    const { ctx } = world;
    const dense = (id: number | null) => (id === null ? -1 : (ctx.indexOfId.get(id) ?? -1));
    const earlier = new Set<number>();
    const lists: Record<string, ListAround> = {};
    let propagate = reach === 'all';
    // Everything the fills read from the store, read before any shelf is filled and written.
    const reads = new Map(shelves.map((s) => [s.id, readShelf(this.db, s, edition)]));
    const writes: { shelfId: number; slots: FilledShelf['slots']; violations: RuleViolation[] }[] = [];
    let target: { shelf: Shelf; filled: FilledShelf; changes: ListChanges } | undefined;
    for (const s of shelves) {
      const storedIds = reads.get(s.id)!.stored.map((r) => r.itemId);
      const stored = Int32Array.from(storedIds, dense);
      if (!propagate && s.id !== targetId) {
        for (const i of stored) if (i >= 0) earlier.add(i);
        continue;
      }
      const used = new Set(earlier);
      for (const [id, items] of frozen) if (id !== s.id) for (const i of items) if (i >= 0) used.add(i);
      const back = how.restore?.[String(s.id)];
      const restoring = back !== undefined && sameList(storedIds, back.after);
      let mode: FillMode;
      if (how.start === 'over' && s.id === targetId) mode = 'full';
      else if (restoring) mode = { current: Int32Array.from(back.before, dense), repair: false, measureGivenUp: s.id === targetId };
      else {
        const rescored = s.id === targetId && how.rescored ? how.rescored : undefined;
        mode = { current: stored, repair: true, measureGivenUp: s.id === targetId, ...(rescored && { rescored }) };
      }
      const filled = fillAndMeter(world, s, edition, reads.get(s.id)!, edits.get(s.id)!, mode, used);
      const afterIds = filled.slots.map((r) => r.itemId);
      // An undone list that is still admissible comes back exactly, with the violations it had.
      const violations = restoring && sameList(afterIds, back.before) ? back.beforeViolations : filled.violations;
      writes.push({ shelfId: s.id, slots: filled.slots, violations });
      if (!sameList(storedIds, afterIds)) {
        lists[String(s.id)] = { before: storedIds, beforeViolations: s.violations, after: afterIds };
      }
      const before = new Set(stored.filter((i) => i >= 0));
      let changed = false;
      for (const i of filled.dense) {
        if (i < 0) continue;
        earlier.add(i);
        if (!before.delete(i)) changed = true;
      }
      propagate = propagate || changed || before.size > 0;
      if (s.id === targetId) target = { shelf: s, filled: { ...filled, violations }, changes: filled.changes ?? listChanges(stored, filled.dense) };
    }
    if (!target) throw new NotFoundError(`no shelf with id ${targetId} in edition '${edition.label}'`);
    // Then the writes, all after the fills: no fill above read a list written in this refill.
    for (const w of writes) this.shelves.replaceSlots(w.shelfId, w.slots, w.violations);
    const { shelf, filled, changes } = target;
    const view: ShelfView = {
      ...shelfView(edition, shelf, filled, this.#item(world), this.editorial.entries(shelf.id), edits.get(shelf.id)!),
      changes: changesView(changes, (i) => world.ds.items[i], shelf.brief),
      relevanceGivenUp: filled.relevanceGivenUp ?? null,
    };
    return { view, lists };
  }

  newEdition(label: string, date: string, from?: string): EditionView {
    const world = this.world();
    const id = this.db.transaction(() => {
      const e = this.editions.create(label, date, this.clock());
      if (from !== undefined) {
        // A new edition from a previous one copies its shelves and briefs (with every limit and filter they
        // hold), not its slots: every shelf is filled afresh (so the rest period and new items show at once).
        // Bans come along as their scope says (ban-scope.ts): 'later' and 'until' a date on or after this one.
        const source = this.editions.byLabel(from);
        for (const s of this.shelves.list(source.id)) {
          const shelf = this.shelves.add(e.id, s.label, s.brief);
          this.#carryBans(source, s, e, shelf);
          this.#refillEdition(world, e, shelf.id, 'all', { start: 'over' });
        }
      }
      return e.id;
    })();
    return this.showEdition(this.editions.get(id).label);
  }

  /** Starts the copied shelf's log with the bans of `s` whose scope reaches the new edition's date. */
  #carryBans(source: Edition, s: Shelf, e: Edition, shelf: Shelf): void {
    const edits = this.#edits(s);
    const bans = Object.fromEntries(Object.entries(edits.bans).filter(([, scope]) => carriesTo(scope, source.date, e.date)));
    const banRules = Object.fromEntries(Object.entries(edits.banRules).filter(([, r]) => carriesTo(r.scope, source.date, e.date)));
    if (Object.keys(bans).length + Object.keys(banRules).length === 0) return;
    const log = this.editorial.log(shelf.id);
    const r = doAction(replay(emptyEdits(), log), log, { kind: 'carry', from: source.label, bans, banRules });
    this.editorial.append(shelf.id, r.log.records[r.log.cursor - 1]!, null, this.clock());
    this.editorial.materialise(shelf.id, e.id, r.state);
  }

  listEditions(): Edition[] {
    return this.editions.list();
  }

  showEdition(label: string): EditionView {
    const r = this.readEdition(label);
    return { ...r.edition, shelves: r.shelves.map((x) => x.view), meter: r.meter };
  }

  /**
   * Every shelf of an edition as stored, each read once (its slots with row ids, its meter and its view), and
   * the edition meter over those same lists: what a view and a publish snapshot are both built from.
   */
  readEdition(label: string): { edition: Edition; shelves: { filled: FilledShelf; view: ShelfView }[]; meter: EditionMeter } {
    const world = this.world();
    const e = this.editions.byLabel(label);
    const shelves = this.shelves.list(e.id).map((s) => this.#readFilled(world, e, s));
    return { edition: e, shelves, meter: meterEdition(world.ctx, shelves.map((x) => x.filled.dense)) };
  }

  /**
   * A brief that leaves out `weights` gets dials set for it (services/curation/brief-dials.ts): at most 5% of
   * validated relevance for its audience and anchors. Weights given are the editor's and are kept.
   */
  addShelf(edition: string, label: string, brief: BriefRequest): ShelfView {
    const world = this.world();
    const given = aimByName(withDefaultWeights(brief), world.groupNames);
    checkBriefNames(namesOf(world), given);
    return this.db.transaction(() => {
      const e = this.#draft(edition);
      const b = dialsFor(world, given, brief.weights !== undefined, undefined, dateMs(e.date));
      return this.#refillEdition(world, e, this.shelves.add(e.id, label, b).id, 'fromTarget', { start: 'over' }).view;
    })();
  }

  /**
   * A new brief is an editorial action (kind 'brief'): logged, undoable, and filled stably, so the list
   * keeps every item the new brief still admits (core/curation/stable-fill.ts); Refill starts over.
   * Dials set for the brief stay set for it (and are set again when its audience or anchors change) unless
   * the editor sends other weights, which are theirs from then on (brief-dials.ts `dialsFor`).
   */
  setBrief(edition: string, label: string, brief: BriefRequest, reason?: string): ShelfView {
    const world = this.world();
    const given = aimByName(withDefaultWeights(brief), world.groupNames);
    checkBriefNames(namesOf(world), given);
    return this.db.transaction(() => {
      const e = this.#draft(edition);
      const s = this.shelves.byLabel(e.id, label);
      const b = dialsFor(world, given, brief.weights !== undefined, s.brief, dateMs(e.date));
      if (b.size < s.size) {
        const pinnedBeyond = Object.keys(this.#edits(s).pins).filter((k) => Number(k) >= b.size);
        if (pinnedBeyond.length) {
          throw new InputError(`Slots (size): slot ${Number(pinnedBeyond[0]) + 1} is pinned; unpin it before shrinking the shelf`);
        }
      }
      // Applying the brief the shelf already has changes nothing and logs nothing (deep equality: the dials'
      // fields may come back in another order).
      if (isDeepStrictEqual(b, s.brief)) return this.#read(world, e, s);
      return this.#apply(world, e, s, { kind: 'brief', brief: b, was: s.brief }, reason);
    })();
  }

  /**
   * The meter's target bands (issue 12 item 4): replaces the brief's `targets` and fills nothing, since a
   * band changes how readings are judged, not the list. Checked by the brief's own schema; a published
   * edition refuses (#draft).
   */
  setTargets(edition: string, label: string, targets: LooseTargets): ShelfView {
    const problem = targetProblem(targets);
    if (problem) throw new InputError(problem);
    const world = this.world();
    return this.db.transaction(() => {
      const e = this.#draft(edition);
      const s = this.shelves.byLabel(e.id, label);
      const b = parseBrief({ ...s.brief, targets });
      this.shelves.setBrief(s.id, b);
      return this.#read(world, e, this.shelves.byLabel(e.id, label));
    })();
  }

  /**
   * Refill: fills the shelf afresh, the only way to start over (e.g. after new signals); later shelves keep
   * their lists but for what the new one takes. Only reads the shelf and its meter when `refill` is false.
   */
  fill(edition: string, label: string, refill = true): ShelfView {
    const world = this.world();
    if (!refill) {
      const e = this.editions.byLabel(edition);
      return this.#read(world, e, this.shelves.byLabel(e.id, label));
    }
    return this.act(edition, label, { kind: 'refill' });
  }

  #resolve(world: CurationWorld, edition: Edition, shelf: Shelf, a: ActionRequest): EditAction {
    const item = (ext: string): number => {
      const it = this.items.byExternalId(ext);
      if (!it) throw new NotFoundError(`no item with id '${ext}'`);
      return it.id;
    };
    switch (a.kind) {
      case 'pin':
        return { kind: 'pin', slot: a.slot - 1, item: item(a.item) };
      case 'unpin':
        return { kind: 'unpin', slot: a.slot - 1 };
      case 'ban':
        return { kind: 'ban', item: item(a.item), scope: checkScope(a.scope, edition.date) };
      case 'banRule':
        checkName(namesOf(world), a.facet, a.value, a.facet);
        return { kind: 'banRule', facet: a.facet, value: a.value, scope: checkScope(a.scope, edition.date) };
      case 'unbanRule':
        if (!(ruleKey(a.facet, a.value) in this.#edits(shelf).banRules)) {
          throw new InputError(`this shelf has no ban on the ${a.facet} '${a.value}'`);
        }
        return { kind: 'unbanRule', facet: a.facet, value: a.value };
      case 'boost':
        return { kind: 'boost', item: item(a.item), factor: a.factor };
      case 'lock': {
        const slots = new Array<number>(shelf.size).fill(-1);
        for (const r of this.shelves.slots(shelf.id)) if (r.slot < shelf.size) slots[r.slot] = r.itemId ?? -1;
        return { kind: 'lock', slots };
      }
      case 'unlock':
        return { kind: 'unlock' };
      case 'unban': {
        const id = item(a.item);
        if (!(String(id) in this.#edits(shelf).bans)) throw new InputError(`item: '${a.item}' is not banned on this shelf`, { column: 'item' });
        return { kind: 'unban', item: id };
      }
      case 'refill':
        return { kind: 'refill' };
      case 'anchors':
        // Whole row ids by the request's type; that they exist is checked here.
        checkBriefNames(namesOf(world), { ...shelf.brief, anchors: a.anchors });
        return { kind: 'anchors', anchors: a.anchors.slice(), was: shelf.brief.anchors.slice() };
      case 'move': {
        const at = this.shelves.slots(shelf.id).find((s) => s.slot === a.from - 1)?.itemId;
        if (at === undefined || at === null) throw new InputError(`from: slot ${a.from} is empty; nothing to move`, { column: 'from' });
        return { kind: 'move', from: a.from - 1, to: a.to - 1, item: at };
      }
    }
  }

  /** Applies one editorial action, stores it with its time and reason, re-fills (unless locked) and meters. */
  act(edition: string, label: string, request: ActionRequest, reason?: string): ShelfView {
    const world = this.world();
    return this.db.transaction(() => {
      const e = this.#draft(edition);
      const shelf = this.shelves.byLabel(e.id, label);
      return this.#apply(world, e, shelf, this.#resolve(world, e, shelf, request), reason);
    })();
  }

  /** Logs one action, stores its state, re-fills and meters; inside the caller's transaction. */
  #apply(world: CurationWorld, e: Edition, shelf: Shelf, action: EditAction, reason?: string): ShelfView {
    checkAction(action, shelf.size);
    const log = this.editorial.log(shelf.id);
    const r = doAction(replay(emptyEdits(), log), log, action);
    const record = r.log.records[r.log.cursor - 1]!;
    this.editorial.append(shelf.id, record, reason?.trim() || null, this.clock());
    const out = this.#settle(world, e, shelf, r, record, 'do');
    this.editorial.mark(shelf.id, r.log.cursor - 1, false, { ...record, lists: out.lists });
    // The log entry now holds the lists, so it can name the slots.
    return { ...out.view, actions: actionViews(this.editorial.entries(shelf.id), shelf.id, this.#item(world)) };
  }

  undo(edition: string, label: string): ShelfView {
    return this.#step(edition, label, 'undo');
  }

  redo(edition: string, label: string): ShelfView {
    return this.#step(edition, label, 'redo');
  }

  #step(edition: string, label: string, dir: 'undo' | 'redo'): ShelfView {
    const world = this.world();
    return this.db.transaction(() => {
      const e = this.#draft(edition);
      const shelf = this.shelves.byLabel(e.id, label);
      const log = this.editorial.log(shelf.id);
      const state = replay(emptyEdits(), log);
      if (dir === 'undo') {
        const r = undoLog(state, log);
        this.editorial.mark(shelf.id, log.cursor - 1, true);
        return this.#settle(world, e, shelf, r, log.records[log.cursor - 1]!, 'undo').view;
      }
      const r = redoLog(state, log);
      const record = r.log.records[log.cursor]!;
      this.editorial.mark(shelf.id, log.cursor, false, record);
      const out = this.#settle(world, e, shelf, r, record, 'redo');
      this.editorial.mark(shelf.id, log.cursor, false, { ...record, lists: out.lists });
      return { ...out.view, actions: actionViews(this.editorial.entries(shelf.id), shelf.id, this.#item(world)) };
    })();
  }

  /**
   * Stores the state after `record` (done, undone or redone) and re-fills what it can reach: a stable
   * fill that keeps the lists, or on undo the lists the record kept from before it.
   */
  #settle(world: CurationWorld, e: Edition, shelf: Shelf, r: Edited, record: EditRecord, dir: 'do' | 'undo' | 'redo') {
    const action = record.action;
    this.editorial.materialise(shelf.id, e.id, r.state);
    if (r.state.locked !== shelf.locked) this.shelves.setLocked(shelf.id, r.state.locked);
    if (action.kind === 'anchors') {
      // New anchors are a new relevance: dials set for the brief are set again for them (the editor's stay).
      const anchors = dir === 'undo' ? action.was : action.anchors;
      this.shelves.setBrief(shelf.id, dialsFor(world, { ...shelf.brief, anchors }, false, shelf.brief, dateMs(e.date)));
    }
    if (action.kind === 'brief') this.shelves.setBrief(shelf.id, dir === 'undo' ? action.was : action.brief);
    const liftedScope =
      action.kind === 'unban'
        ? record.before.bans[String(action.item)]
        : action.kind === 'unbanRule'
          ? record.before.banRules[ruleKey(action.facet, action.value)]?.scope
          : null;
    const wide =
      action.kind === 'lock' ||
      action.kind === 'unlock' ||
      action.kind === 'carry' ||
      ((action.kind === 'ban' || action.kind === 'banRule') && editionWide(action.scope)) ||
      (liftedScope !== null && liftedScope !== undefined && editionWide(liftedScope));
    let how: RefillHow = { start: 'stable' };
    if (dir === 'undo') how = { start: 'stable', restore: record.lists ?? {} };
    else if (action.kind === 'refill' || action.kind === 'anchors') how = { start: 'over' };
    else if (action.kind === 'boost') {
      const item = world.ctx.indexOfId.get(action.item);
      const was = record.before.boosts[String(action.item)] ?? 1;
      if (item !== undefined && action.factor !== was) how = { start: 'stable', rescored: { item, direction: action.factor > was ? 'up' : 'down' } };
    }
    return this.#refillEdition(world, e, shelf.id, wide ? 'all' : 'fromTarget', how);
  }

  /** What-if for one slot (whatif.ts). */
  whatIf(edition: string, label: string, slot: number, n = 20): WhatIfView {
    return shelfWhatIf(this, edition, label, slot, n);
  }

  /** Freezes the edition into read-only history (publish.ts). */
  publish(label: string): EditionSnapshot {
    return publishEdition(this, label);
  }

  /** The snapshot of a published edition, or a draft's current state in the same form (publish.ts). */
  snapshotOf(label: string): EditionSnapshot {
    return editionSnapshot(this, label);
  }

  compare(a: string, b: string): { shelves: ShelfDiff[]; titles: Record<string, string> } {
    const sa = this.snapshotOf(a);
    const sb = this.snapshotOf(b);
    return { shelves: compareEditions(sa, sb), titles: titlesOn(sa, sb) };
  }

  /** The shelf's editorial state, replayed from its log. */
  editsOf(shelf: Shelf): ShelfEdits {
    return this.#edits(shelf);
  }
}

/** The catalogue's category, supplier and tag names, read once per loaded world. */
function namesOf(world: CurationWorld): CatalogueNames {
  let names = world.memo.get('catalogueNames') as CatalogueNames | undefined;
  if (!names) world.memo.set('catalogueNames', (names = catalogueNames(world.ds.items)));
  return names;
}

/** Whether a brief as sent carries weights of its own (the editor's dials) rather than leaving them to the service. */
