import { describe, expect, it } from 'vitest';
import { seededRng, type Rng } from '../../src-main/core/rng.ts';
import {
  applyAction,
  checkAction,
  doAction,
  emptyEdits,
  emptyLog,
  redo,
  replay,
  undo,
  type EditAction,
  type ShelfEdits,
} from '../../src-main/core/editing/index.ts';

const SIZE = 8;
const SCOPES = ['shelf', 'edition', 'always'] as const;
const FACETS = ['category', 'supplier', 'tag'] as const;

function randomAction(rng: Rng): EditAction {
  const item = 1 + rng.int(20);
  switch (rng.int(9)) {
    case 0:
    case 1:
      return { kind: 'pin', slot: rng.int(SIZE), item };
    case 2:
      return { kind: 'unpin', slot: rng.int(SIZE) };
    case 3:
      return { kind: 'ban', item, scope: SCOPES[rng.int(3)]! };
    case 4:
      return { kind: 'banRule', facet: FACETS[rng.int(3)]!, value: `v${rng.int(5)}`, scope: SCOPES[rng.int(3)]! };
    case 5:
      return { kind: 'boost', item, factor: [0.5, 1, 1.5, 2][rng.int(4)]! };
    case 6:
      return rng.int(2) === 0 ? { kind: 'lock', slots: Array.from({ length: SIZE }, () => rng.int(21) - 1) } : { kind: 'unlock' };
    default:
      return { kind: 'move', from: rng.int(SIZE), to: rng.int(SIZE), item };
  }
}

/** A non-empty starting state, so "back to the start" cannot pass by accident on an empty one. */
function startState(): ShelfEdits {
  let s = emptyEdits();
  for (const a of [
    { kind: 'pin', slot: 0, item: 3 },
    { kind: 'ban', item: 7, scope: 'edition' },
    { kind: 'boost', item: 4, factor: 2 },
    { kind: 'banRule', facet: 'tag', value: 'v1', scope: 'shelf' },
  ] as EditAction[]) {
    s = applyAction(s, a).state;
  }
  return s;
}

describe('editorial action log', () => {
  // Undo as the exact inverse of each command, the "unexecute" of the Command pattern (Gamma, Helm,
  // Johnson & Vlissides, Design Patterns, 1994; recalled from memory). Checked against the slow
  // reference: replaying the log from the start.
  it('undoes 1,000 seeded random actions back to the exact start and redoes them to the exact end', () => {
    const rng = seededRng(20261201);
    const start = startState();
    let state = start;
    let log = emptyLog();
    for (let k = 0; k < 1000; k++) {
      const a = randomAction(rng);
      checkAction(a, SIZE);
      ({ state, log } = doAction(state, log, a));
    }
    const end = state;
    expect(end).toEqual(replay(start, log));
    expect(end).not.toEqual(start);
    for (let k = 0; k < 1000; k++) ({ state, log } = undo(state, log));
    expect(state).toEqual(start);
    expect(() => undo(state, log)).toThrow(/nothing to undo/);
    for (let k = 0; k < 1000; k++) ({ state, log } = redo(state, log));
    expect(state).toEqual(end);
    expect(() => redo(state, log)).toThrow(/nothing to redo/);
  });

  it('matches a replay of the log after any mix of actions, undos and redos', () => {
    const rng = seededRng(7);
    const start = startState();
    let state = start;
    let log = emptyLog();
    for (let k = 0; k < 1000; k++) {
      const r = rng.int(10);
      if (r < 2 && log.cursor > 0) ({ state, log } = undo(state, log));
      else if (r < 3 && log.cursor < log.records.length) ({ state, log } = redo(state, log));
      else ({ state, log } = doAction(state, log, randomAction(rng)));
      expect(state).toEqual(replay(start, log));
    }
  });

  it('drops the redo tail when a new action follows an undo', () => {
    let state = emptyEdits();
    let log = emptyLog();
    ({ state, log } = doAction(state, log, { kind: 'pin', slot: 0, item: 1 }));
    ({ state, log } = doAction(state, log, { kind: 'pin', slot: 1, item: 2 }));
    ({ state, log } = undo(state, log));
    ({ state, log } = doAction(state, log, { kind: 'lock', slots: [1, -1] }));
    expect(log.records.map((r) => r.action.kind)).toEqual(['pin', 'lock']);
    expect(() => redo(state, log)).toThrow(/nothing to redo/);
    expect(state).toEqual({ pins: { '0': 1 }, bans: {}, banRules: {}, boosts: {}, locked: true, frozen: [1, -1] });
  });

  it('keeps an item on one slot: pinning it elsewhere moves it, banning it unpins it', () => {
    let s = applyAction(emptyEdits(), { kind: 'pin', slot: 2, item: 9 }).state;
    s = applyAction(s, { kind: 'pin', slot: 5, item: 9 }).state;
    expect(s.pins).toEqual({ '5': 9 });
    s = applyAction(s, { kind: 'ban', item: 9, scope: 'always' }).state;
    expect(s.pins).toEqual({});
    expect(s.bans).toEqual({ '9': 'always' });
  });

  it('swaps pins when an item is moved onto a pinned slot', () => {
    let s = applyAction(emptyEdits(), { kind: 'pin', slot: 0, item: 1 }).state;
    s = applyAction(s, { kind: 'pin', slot: 3, item: 2 }).state;
    s = applyAction(s, { kind: 'move', from: 0, to: 3, item: 1 }).state;
    expect(s.pins).toEqual({ '3': 1, '0': 2 });
  });

  it('keeps the first frozen slots when a locked shelf is locked again, and restores them when an unlock is undone', () => {
    let state = emptyEdits();
    let log = emptyLog();
    ({ state, log } = doAction(state, log, { kind: 'lock', slots: [4, 5] }));
    ({ state, log } = doAction(state, log, { kind: 'lock', slots: [6, 7] }));
    expect(state.frozen).toEqual([4, 5]);
    ({ state, log } = doAction(state, log, { kind: 'unlock' }));
    expect(state).toMatchObject({ locked: false, frozen: null });
    ({ state, log } = undo(state, log));
    expect(state).toMatchObject({ locked: true, frozen: [4, 5] });
    expect(log.cursor).toBe(2);
  });

  it('treats a factor of 1 as removing the boost and rejects factors at or below 0', () => {
    let s = applyAction(emptyEdits(), { kind: 'boost', item: 4, factor: 3 }).state;
    s = applyAction(s, { kind: 'boost', item: 4, factor: 1 }).state;
    expect(s.boosts).toEqual({});
    expect(() => checkAction({ kind: 'boost', item: 4, factor: 0 }, SIZE)).toThrow(/factor: must be a number above 0/);
    expect(() => checkAction({ kind: 'pin', slot: 8, item: 4 }, SIZE)).toThrow(/slot must be between 1 and 8, got 9/);
  });
});
