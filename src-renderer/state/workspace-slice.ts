import type { StateCreator } from 'zustand';
import type { ResponseOf } from '../../src-main/api/contract.ts';
import { describeError, type Client } from '../client/client.ts';
import type { AppState } from './store.ts';

export type WorkspaceInfo = ResponseOf<'workspace.info'>;
export type WorkspaceStats = ResponseOf<'workspace.stats'>;
export type LoadStatus = 'idle' | 'loading' | 'ready' | 'error';

export interface WorkspaceSlice {
  workspace: {
    info: WorkspaceInfo | null;
    status: LoadStatus;
    /** Why the last load failed, in plain words (shown on the overview). */
    loadError: string | null;
    /** Why opening another file failed (shown beside the open form). */
    openError: string | null;
    opening: boolean;
    /** When the info was last read (ms), so the overview can say how fresh its numbers are. */
    readAt: number | null;
    /** Date range, last import and more; null until read or when no workspace is open. */
    stats: WorkspaceStats | null;
  };
  /** The shell takes paths on its machine (Electron): the page may offer path fields (see Client.serverPaths). */
  canNamePaths: boolean;
  loadWorkspace(): Promise<void>;
  openWorkspace(file: string, create: boolean): Promise<boolean>;
  loadStats(): Promise<void>;
}

export const initialWorkspace: WorkspaceSlice['workspace'] = {
  info: null,
  status: 'idle',
  loadError: null,
  openError: null,
  opening: false,
  readAt: null,
  stats: null,
};

export function createWorkspaceSlice(client: Client, now: () => number): StateCreator<AppState, [], [], WorkspaceSlice> {
  return (set, get) => ({
    workspace: initialWorkspace,
    canNamePaths: client.serverPaths,
    async loadWorkspace() {
      set((s) => ({ workspace: { ...s.workspace, status: 'loading', loadError: null } }));
      try {
        const info = await client.call('workspace.info', {});
        set((s) => ({ workspace: { ...s.workspace, info, status: 'ready', readAt: now() } }));
      } catch (e) {
        set((s) => ({ workspace: { ...s.workspace, status: 'error', loadError: describeError(e) } }));
        return;
      }
      await get().loadStats();
    },
    async loadStats() {
      if (!get().workspace.info?.open) {
        set((s) => ({ workspace: { ...s.workspace, stats: null } }));
        return;
      }
      try {
        const stats = await client.call('workspace.stats', {});
        set((s) => ({ workspace: { ...s.workspace, stats } }));
      } catch {
        // Statistics are extra: the counts above still show; the next load tries again.
      }
    },
    async openWorkspace(file, create) {
      set((s) => ({ workspace: { ...s.workspace, opening: true, openError: null } }));
      try {
        const info = await client.call('workspace.open', { file, create });
        // Nothing read from the previous workspace may be shown for this one (models, editions, messages).
        get().forgetWorkspaceState();
        set({ workspace: { ...initialWorkspace, info, status: 'ready', readAt: now() } });
        await get().loadStats();
        return true;
      } catch (e) {
        set((s) => ({ workspace: { ...s.workspace, opening: false, openError: describeError(e) } }));
        return false;
      }
    },
  });
}
