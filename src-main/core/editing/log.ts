/**
 * The action log of one shelf with undo and redo. `cursor` counts the records in effect; records at and
 * after it form the redo tail, which a new action drops (the usual linear undo model of editors).
 */
import { InputError } from '../errors.ts';
import { applyAction, revertAction, type EditAction, type EditRecord, type ShelfEdits } from './actions.ts';

export interface EditLog {
  records: EditRecord[];
  cursor: number;
}

export interface Edited {
  state: ShelfEdits;
  log: EditLog;
}

export function emptyLog(): EditLog {
  return { records: [], cursor: 0 };
}

export function doAction(state: ShelfEdits, log: EditLog, action: EditAction): Edited {
  const r = applyAction(state, action);
  return { state: r.state, log: { records: [...log.records.slice(0, log.cursor), r.record], cursor: log.cursor + 1 } };
}

export function canUndo(log: EditLog): boolean {
  return log.cursor > 0;
}

export function canRedo(log: EditLog): boolean {
  return log.cursor < log.records.length;
}

export function undo(state: ShelfEdits, log: EditLog): Edited {
  if (!canUndo(log)) throw new InputError('nothing to undo on this shelf');
  const rec = log.records[log.cursor - 1] as EditRecord;
  return { state: revertAction(state, rec), log: { records: log.records, cursor: log.cursor - 1 } };
}

export function redo(state: ShelfEdits, log: EditLog): Edited {
  if (!canRedo(log)) throw new InputError('nothing to redo on this shelf');
  const rec = log.records[log.cursor] as EditRecord;
  // Re-applying the action recomputes what it overwrites, which equals the stored `before` because the
  // state is exactly the one it was first applied to.
  const r = applyAction(state, rec.action);
  const records = log.records.slice();
  records[log.cursor] = r.record;
  return { state: r.state, log: { records, cursor: log.cursor + 1 } };
}

/** The state after replaying the records in effect from `initial` (the slow reference the tests use). */
export function replay(initial: ShelfEdits, log: EditLog): ShelfEdits {
  let s = initial;
  for (let k = 0; k < log.cursor; k++) s = applyAction(s, (log.records[k] as EditRecord).action).state;
  return s;
}
