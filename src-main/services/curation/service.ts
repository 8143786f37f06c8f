/**
 * The curation use cases: editions, shelves, editorial actions with undo and redo, publish and compare.
 * Every write is one transaction: the log entry, the materialised bans and boosts, the lock flag and the
 * re-filled slots commit together or not at all (better-sqlite3 docs/api.md, .transaction).
 */
import { meterEdition } from '../../core/curation/edition-meter.ts';
import { InputError, NotFoundError } from '../../core/errors.ts';
import {
  checkAction,
  compareEditions,
  titlesOn,
  doAction,
  redo as redoLog,
  replay,
  undo as undoLog,
  emptyEdits,
  type EditAction,
  type Edited,
  type EditionSnapshot,
  type ShelfDiff,
  type ShelfEdits,
} from '../../core/editing/index.ts';
import { parseBrief } from '../../core/editing/brief-schema.ts';
import { catalogueNames, checkBriefNames, checkName, type CatalogueNames } from '../../core/curation/brief-names.ts';
import type { Item } from '../../core/types.ts';
import type { EditionRepo, Edition } from '../../store/editions.ts';
import type { EditorialRepo } from '../../store/editorial-actions.ts';
import type { ItemRepo } from '../../store/items.ts';
import type { ShelfRepo, Shelf } from '../../store/shelves.ts';
import type { Db } from '../../store/workspace.ts';
import { curationRepos } from './repos.ts';
import { fillAndMeter, frozenDense } from './shelf-fill.ts';
import { editionSnapshot, publishEdition } from './publish.ts';
import { shelfView, type EditionView, type ShelfView } from './views.ts';
import { shelfWhatIf, type WhatIfView } from './whatif.ts';
import { loadWorld, noModels, type CurationWorld, type ModelSource } from './world.ts';

/** An action as the editor names it: items by external id, slots 1-based. */
export type ActionRequest =
  | { kind: 'pin'; slot: number; item: string }
  | { kind: 'unpin'; slot: number }
  | { kind: 'ban'; item: string; scope: 'shelf' | 'edition' | 'always' }
  | { kind: 'banRule'; facet: 'category' | 'supplier' | 'tag'; value: string; scope: 'shelf' | 'edition' | 'always' }
  | { kind: 'boost'; item: string; factor: number }
  | { kind: 'lock' }
  | { kind: 'unlock' }
  | { kind: 'move'; from: number; to: number };

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
    const filled = fillAndMeter(this.db, world, shelf, edition, this.#edits(shelf), false);
    return shelfView(edition, shelf, filled, this.#item(world), this.editorial.entries(shelf.id));
  }

  /**
   * Fills the shelves of the edition again, in position order, and stores them; returns the view of the
   * shelf `targetId`. A shelf's fill depends on the others (an item runs once per edition; edition-wide
   * bans), so the edition is one unit: each shelf leaves out the items of the shelves before it and of
   * every locked shelf. The edition's slots are then a function of the briefs, the editorial states and
   * the data, which is what makes undo exact.
   *
   * `reach` 'all' fills every shelf (edition-wide bans, lock and unlock touch every shelf). 'fromTarget'
   * relies on the stored slots being that function already: shelves before the target keep theirs, the
   * target is filled, and later shelves are filled only once an earlier shelf's set of items changed
   * (their inputs are otherwise unchanged). Inside the caller's transaction.
   */
  #refillEdition(world: CurationWorld, edition: Edition, targetId: number, reach: 'all' | 'fromTarget' = 'all'): ShelfView {
    const shelves = this.shelves.list(edition.id);
    const edits = new Map(shelves.map((s) => [s.id, this.#edits(s)]));
    const frozen = new Map<number, Int32Array>();
    for (const s of shelves) {
      const ed = edits.get(s.id)!;
      if (ed.locked) frozen.set(s.id, frozenDense(world, s, ed));
    }
    const dense = (id: number | null) => (id === null ? -1 : (world.ctx.indexOfId.get(id) ?? -1));
    const earlier = new Set<number>();
    let propagate = reach === 'all';
    let view: ShelfView | undefined;
    for (const s of shelves) {
      const stored = this.shelves.slots(s.id).map((r) => dense(r.itemId));
      if (!propagate && s.id !== targetId) {
        for (const i of stored) if (i >= 0) earlier.add(i);
        continue;
      }
      const used = new Set(earlier);
      for (const [id, items] of frozen) if (id !== s.id) for (const i of items) if (i >= 0) used.add(i);
      const filled = fillAndMeter(this.db, world, s, edition, edits.get(s.id)!, true, used);
      this.shelves.replaceSlots(s.id, filled.slots, filled.violations);
      const before = new Set(stored.filter((i) => i >= 0));
      let changed = false;
      for (const i of filled.dense) {
        if (i < 0) continue;
        earlier.add(i);
        if (!before.delete(i)) changed = true;
      }
      propagate = propagate || changed || before.size > 0;
      if (s.id === targetId) view = shelfView(edition, this.shelves.get(s.id), filled, this.#item(world), this.editorial.entries(s.id));
    }
    if (!view) throw new NotFoundError(`no shelf with id ${targetId} in edition '${edition.label}'`);
    return view;
  }

  newEdition(label: string, date: string, from?: string): EditionView {
    const world = this.world();
    const id = this.db.transaction(() => {
      const e = this.editions.create(label, date, this.clock());
      if (from !== undefined) {
        // A new edition from a previous one copies its shelves and briefs, not its slots: every shelf is
        // filled afresh (so the rest period and new items show at once).
        for (const s of this.shelves.list(this.editions.byLabel(from).id)) {
          const shelf = this.shelves.add(e.id, s.label, s.brief);
          this.#refillEdition(world, e, shelf.id);
        }
      }
      return e.id;
    })();
    return this.showEdition(this.editions.get(id).label);
  }

  listEditions(): Edition[] {
    return this.editions.list();
  }

  showEdition(label: string): EditionView {
    const world = this.world();
    const e = this.editions.byLabel(label);
    const shelves = this.shelves.list(e.id).map((s) => this.#read(world, e, s));
    const { ctx } = world;
    const dense = shelves.map((v) =>
      Int32Array.from(this.shelves.slots(this.shelves.byLabel(e.id, v.label).id), (s) =>
        s.itemId === null ? -1 : (ctx.indexOfId.get(s.itemId) ?? -1),
      ),
    );
    return { ...e, shelves, meter: meterEdition(ctx, dense) };
  }

  addShelf(edition: string, label: string, brief: unknown): ShelfView {
    const world = this.world();
    const b = parseBrief(brief);
    checkBriefNames(namesOf(world), b);
    return this.db.transaction(() => {
      const e = this.#draft(edition);
      return this.#refillEdition(world, e, this.shelves.add(e.id, label, b).id, 'fromTarget');
    })();
  }

  setBrief(edition: string, label: string, brief: unknown): ShelfView {
    const world = this.world();
    const b = parseBrief(brief);
    checkBriefNames(namesOf(world), b);
    return this.db.transaction(() => {
      const e = this.#draft(edition);
      const s = this.shelves.byLabel(e.id, label);
      if (b.size < s.size) {
        const pinnedBeyond = Object.keys(this.#edits(s).pins).filter((k) => Number(k) >= b.size);
        if (pinnedBeyond.length) throw new InputError(`size: slot ${Number(pinnedBeyond[0]) + 1} is pinned; unpin it before shrinking the shelf`);
      }
      this.shelves.setBrief(s.id, b);
      return this.#refillEdition(world, e, s.id, 'fromTarget');
    })();
  }

  /** Fills the shelf again (e.g. after new signals), or only reads it and its meter when `refill` is false. */
  fill(edition: string, label: string, refill = true): ShelfView {
    const world = this.world();
    if (!refill) {
      const e = this.editions.byLabel(edition);
      return this.#read(world, e, this.shelves.byLabel(e.id, label));
    }
    return this.db.transaction(() => {
      const e = this.#draft(edition);
      return this.#refillEdition(world, e, this.shelves.byLabel(e.id, label).id);
    })();
  }

  #resolve(world: CurationWorld, shelf: Shelf, a: ActionRequest): EditAction {
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
        return { kind: 'ban', item: item(a.item), scope: a.scope };
      case 'banRule':
        checkName(namesOf(world), a.facet, a.value, a.facet);
        return { kind: 'banRule', facet: a.facet, value: a.value, scope: a.scope };
      case 'boost':
        return { kind: 'boost', item: item(a.item), factor: a.factor };
      case 'lock': {
        const slots = new Array<number>(shelf.size).fill(-1);
        for (const r of this.shelves.slots(shelf.id)) if (r.slot < shelf.size) slots[r.slot] = r.itemId ?? -1;
        return { kind: 'lock', slots };
      }
      case 'unlock':
        return { kind: 'unlock' };
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
      const action = this.#resolve(world, shelf, request);
      checkAction(action, shelf.size);
      const log = this.editorial.log(shelf.id);
      const r = doAction(replay(emptyEdits(), log), log, action);
      this.editorial.append(shelf.id, r.log.records[r.log.cursor - 1]!, reason?.trim() || null, this.clock());
      return this.#settle(world, e, shelf, r, action);
    })();
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
        return this.#settle(world, e, shelf, r, log.records[log.cursor - 1]!.action);
      }
      const r = redoLog(state, log);
      this.editorial.mark(shelf.id, log.cursor, false, r.log.records[log.cursor]);
      return this.#settle(world, e, shelf, r, log.records[log.cursor]!.action);
    })();
  }

  /** Stores the state after `action` (done, undone or redone) and re-fills what it can reach. */
  #settle(world: CurationWorld, e: Edition, shelf: Shelf, r: Edited, action: EditAction): ShelfView {
    this.editorial.materialise(shelf.id, e.id, r.state);
    if (r.state.locked !== shelf.locked) this.shelves.setLocked(shelf.id, r.state.locked);
    const wide = action.kind === 'lock' || action.kind === 'unlock' || ((action.kind === 'ban' || action.kind === 'banRule') && action.scope !== 'shelf');
    return this.#refillEdition(world, e, shelf.id, wide ? 'all' : 'fromTarget');
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
