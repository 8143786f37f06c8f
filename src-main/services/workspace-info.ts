import { countWorkspaceRows } from '../store/stats.ts';
import { userVersion } from '../store/workspace.ts';
import type { AppContext } from './context.ts';

export interface WorkspaceInfoResult {
  open: boolean;
  file: string | null;
  schemaVersion: number | null;
  items: number;
  customers: number;
  signals: number;
}

/** Cheap counts for a title bar or a first screen; the full statistics live in stats. */
export function workspaceInfo(ctx: AppContext): WorkspaceInfoResult {
  if (!ctx.isOpen) return { open: false, file: null, schemaVersion: null, items: 0, customers: 0, signals: 0 };
  const db = ctx.db;
  return { open: true, file: ctx.file, schemaVersion: userVersion(db), ...countWorkspaceRows(db) };
}
