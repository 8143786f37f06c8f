/**
 * Editorial actions on one shelf as a pure reducer (DESIGN.md: pin / ban / boost / sink / lock).
 * `applyAction` returns the new state and a record holding what the action overwrote, so `revertAction`
 * restores the exact earlier state without replaying the log from the start.
 * States are never mutated: each action returns fresh objects for what it changed.
 *
 * Items are workspace item ids; slots are 0-based (slot 0 is position 1 on screen).
 */
import { InputError } from '../errors.ts';
import type { Brief, Facet } from '../curation/types.ts';
import type { BanScope } from './ban-scope.ts';

export interface RuleBan {
  facet: Facet;
  value: string;
  scope: BanScope;
}

/** The editor's standing decisions for one shelf. Keys of the records are numbers written as strings. */
export interface ShelfEdits {
  /** slot -> item */
  pins: Record<string, number>;
  /** item -> how far the ban reaches */
  bans: Record<string, BanScope>;
  /** `${facet}:${value}` -> rule */
  banRules: Record<string, RuleBan>;
  /** item -> multiplier on its blended score (> 1 boost, < 1 sink; 1 removes it) */
  boosts: Record<string, number>;
  locked: boolean;
  /**
   * The items a locked shelf keeps, per slot (-1 = empty); null when unlocked. Part of the state, so
   * undoing an unlock restores exactly what the shelf held when it was locked.
   */
  frozen: number[] | null;
}

export type EditAction =
  | { kind: 'pin'; slot: number; item: number }
  | { kind: 'unpin'; slot: number }
  | { kind: 'ban'; item: number; scope: BanScope }
  | { kind: 'banRule'; facet: Facet; value: string; scope: BanScope }
  | { kind: 'boost'; item: number; factor: number }
  /** `slots`: the items on the shelf when it is locked (the service reads them). */
  | { kind: 'lock'; slots: number[] }
  | { kind: 'unlock' }
  /** Move the item shown at `from` to `to` by hand: it is pinned there; a pin at `to` swaps to `from`. */
  | { kind: 'move'; from: number; to: number; item: number }
  /** Lift this shelf's ban on an item. */
  | { kind: 'unban'; item: number }
  /** Start the list over (the one action that does): no edit changes; undo puts the old list back. */
  | { kind: 'refill' }
  /** Fill from these anchors: the brief's anchors become `anchors` (`was` before) and the list starts over. */
  | { kind: 'anchors'; anchors: number[]; was: number[] }
  /** Lift this shelf's ban on every item of a category, supplier or tag. */
  | { kind: 'unbanRule'; facet: Facet; value: string }
  /**
   * The bans a shelf copied into a new edition brings along, by their scope (ban-scope.ts `carriesTo`):
   * the first record of the copied shelf's log, so they are its own to lift (or undo).
   */
  | { kind: 'carry'; from: string; bans: Record<string, BanScope>; banRules: Record<string, RuleBan> }
  /**
   * A new brief (`was` before): the service stores it and keeps the list where the new brief allows
   * (the stable fill); undo puts the old brief and the old list back. Briefs as the store keeps them.
   */
  | { kind: 'brief'; brief: Brief; was: Brief };

export type EditKind = EditAction['kind'];

/** What an action overwrote: the earlier value of every key it touched (null = absent). */
export interface Before {
  pins: Record<string, number | null>;
  bans: Record<string, BanScope | null>;
  banRules: Record<string, RuleBan | null>;
  boosts: Record<string, number | null>;
  locked: boolean;
  frozen: number[] | null;
}

/**
 * A shelf's list around an action, by workspace item id per slot (null = empty): what undo puts back.
 * The stable fill makes a list depend on the lists before it, not only on the editorial state, so the
 * record keeps the list each touched shelf had before (with its violations) and the list it left.
 */
export interface ListAround {
  before: (number | null)[];
  beforeViolations: { rule: string; reason: string }[];
  after: (number | null)[];
}

export interface EditRecord {
  action: EditAction;
  before: Before;
  /** Shelf id -> its list around the action, for every shelf whose list the action changed. */
  lists?: Record<string, ListAround>;
}

export function emptyEdits(): ShelfEdits {
  return { pins: {}, bans: {}, banRules: {}, boosts: {}, locked: false, frozen: null };
}

export function ruleKey(facet: Facet, value: string): string {
  return `${facet}:${value}`;
}

/** Checks an action against a shelf of `size` slots; an InputError names the field. */
export function checkAction(a: EditAction, size: number): void {
  const slot = (field: string, s: number) => {
    if (!Number.isInteger(s) || s < 0 || s >= size) {
      throw new InputError(`${field}: slot must be between 1 and ${size}, got ${s + 1}`, { column: field });
    }
  };
  if (a.kind === 'pin' || a.kind === 'unpin') slot('slot', a.slot);
  if (a.kind === 'move') {
    slot('from', a.from);
    slot('to', a.to);
  }
  if (a.kind === 'boost' && !(Number.isFinite(a.factor) && a.factor > 0)) {
    throw new InputError(`factor: must be a number above 0 (above 1 boosts, below 1 sinks), got ${a.factor}`, {
      column: 'factor',
    });
  }
  if ((a.kind === 'banRule' || a.kind === 'unbanRule') && a.value.trim() === '') {
    throw new InputError(`value: name the ${a.facet} to ban`, { column: 'value' });
  }
}

/** Slot of `item` among the pins, or null. */
function slotOf(pins: Record<string, number>, item: number): string | null {
  for (const k in pins) if (pins[k] === item) return k;
  return null;
}

class Draft {
  readonly s: ShelfEdits;
  readonly before: Before;
  constructor(s: ShelfEdits) {
    this.s = {
      pins: { ...s.pins },
      bans: { ...s.bans },
      banRules: { ...s.banRules },
      boosts: { ...s.boosts },
      locked: s.locked,
      frozen: s.frozen,
    };
    this.before = { pins: {}, bans: {}, banRules: {}, boosts: {}, locked: s.locked, frozen: s.frozen };
  }
  set<K extends 'pins' | 'bans' | 'banRules' | 'boosts'>(
    field: K,
    key: string,
    value: ShelfEdits[K][string] | null,
  ): void {
    const rec = this.s[field] as Record<string, unknown>;
    const seen = this.before[field] as Record<string, unknown>;
    if (!(key in seen)) seen[key] = key in rec ? rec[key] : null;
    if (value === null) delete rec[key];
    else rec[key] = value;
  }
}

export function applyAction(state: ShelfEdits, a: EditAction): { state: ShelfEdits; record: EditRecord } {
  const d = new Draft(state);
  const p = d.s.pins;
  switch (a.kind) {
    case 'pin': {
      const at = slotOf(p, a.item);
      if (at !== null) d.set('pins', at, null);
      d.set('pins', String(a.slot), a.item);
      break;
    }
    case 'unpin':
      d.set('pins', String(a.slot), null);
      break;
    case 'ban': {
      // A banned item cannot stay pinned: the ban is the later, explicit decision.
      const at = slotOf(p, a.item);
      if (at !== null) d.set('pins', at, null);
      d.set('bans', String(a.item), a.scope);
      break;
    }
    case 'banRule':
      d.set('banRules', ruleKey(a.facet, a.value), { facet: a.facet, value: a.value, scope: a.scope });
      break;
    case 'boost':
      d.set('boosts', String(a.item), a.factor === 1 ? null : a.factor);
      break;
    case 'lock':
      // Locking a locked shelf keeps what it already froze.
      if (!d.s.locked) d.s.frozen = a.slots.slice();
      d.s.locked = true;
      break;
    case 'unlock':
      d.s.locked = false;
      d.s.frozen = null;
      break;
    case 'unban':
      d.set('bans', String(a.item), null);
      break;
    case 'unbanRule':
      d.set('banRules', ruleKey(a.facet, a.value), null);
      break;
    case 'carry':
      for (const [item, scope] of Object.entries(a.bans)) d.set('bans', item, scope);
      for (const [key, rule] of Object.entries(a.banRules)) d.set('banRules', key, { ...rule });
      break;
    case 'refill':
    case 'anchors':
    case 'brief':
      // The list (and for anchors the brief) is the service's to change; the edits stay as they are.
      break;
    case 'move': {
      const atTo = p[String(a.to)];
      const itemAt = slotOf(p, a.item);
      if (itemAt !== null) d.set('pins', itemAt, null);
      if (atTo !== undefined && atTo !== a.item && a.from !== a.to) d.set('pins', String(a.from), atTo);
      d.set('pins', String(a.to), a.item);
      break;
    }
  }
  return { state: d.s, record: { action: a, before: d.before } };
}

/** The state before `record` was applied to `state` (which must be the state right after it). */
export function revertAction(state: ShelfEdits, record: EditRecord): ShelfEdits {
  const out: ShelfEdits = {
    pins: { ...state.pins },
    bans: { ...state.bans },
    banRules: { ...state.banRules },
    boosts: { ...state.boosts },
    locked: record.before.locked,
    frozen: record.before.frozen,
  };
  const restore = (field: 'pins' | 'bans' | 'banRules' | 'boosts') => {
    const rec = out[field] as Record<string, unknown>;
    for (const [k, v] of Object.entries(record.before[field])) {
      if (v === null) delete rec[k];
      else rec[k] = v;
    }
  };
  restore('pins');
  restore('bans');
  restore('banRules');
  restore('boosts');
  return out;
}
