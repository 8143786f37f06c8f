import { workspaceStats, type WorkspaceStats } from '../store/stats.ts';
import type { Db } from '../store/workspace.ts';

export type { WorkspaceStats } from '../store/stats.ts';

/** The overview figures of a workspace (all SQL lives in store/stats.ts). */
export function getWorkspaceStats(db: Db): WorkspaceStats {
  return workspaceStats(db);
}
