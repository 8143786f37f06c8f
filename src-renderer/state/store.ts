import { createContext, useContext } from 'react';
import { useStore } from 'zustand';
import { createStore, type StoreApi } from 'zustand/vanilla';
import type { Client } from '../client/client.ts';
import { createCurationSlice, type CurationSlice } from './curation-slice.ts';
import { createImportSlice, type ImportSlice } from './import-slice.ts';
import { createInsightSlice, type InsightSlice } from './insight-slice.ts';
import { createModelsSlice, type ModelsSlice } from './models-slice.ts';
import { createNavSlice, type NavSlice } from './nav-slice.ts';
import { createPicturesSlice, type PicturesSlice } from './pictures-slice.ts';
import { createPlannerSlice, type PlannerSlice } from './planner-slice.ts';
import { createWhatIfSlice, type WhatIfSlice } from './whatif-slice.ts';
import { createWorkspaceSlice, type WorkspaceSlice } from './workspace-slice.ts';

/** One store, typed slices (zustand docs, guides/slices-pattern.md); actions call the api client. */
export type AppState = WorkspaceSlice & NavSlice & CurationSlice & ModelsSlice & WhatIfSlice & ImportSlice & InsightSlice & PicturesSlice & PlannerSlice & ResetSlice;

/** Everything a screen holds about the open workspace, dropped when another one is opened. */
export interface ResetSlice {
  /**
   * Puts every screen's state back as it was at start (editions, comparison, models, job, look-ups, imports,
   * errors), so nothing read from the previous workspace is shown for the new one.
   */
  forgetWorkspaceState(): void;
}
export type AppStore = StoreApi<AppState>;

const realSleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

/**
 * The client the slices use: an answer to a call made before another workspace was opened is dropped (its
 * promise never settles), since it describes the old workspace and would land in the screens just cleared.
 */
function droppingStale(client: Client, epoch: () => number): Client {
  const never = new Promise<never>(() => {});
  return {
    ...client,
    call(method, payload) {
      const asked = epoch();
      return client.call(method, payload).then(
        (v) => (asked === epoch() ? v : never),
        (e: unknown) => (asked === epoch() ? Promise.reject(e instanceof Error ? e : new Error(String(e))) : never),
      );
    },
  };
}

export function createAppStore(plainClient: Client, now: () => number = Date.now, sleep = realSleep): AppStore {
  let epoch = 0;
  const client = droppingStale(plainClient, () => epoch);
  return createStore<AppState>()((...a) => {
    const slices = {
      ...createWorkspaceSlice(client, now)(...a),
      ...createNavSlice(...a),
      ...createCurationSlice(client, now)(...a),
      ...createModelsSlice(client, sleep)(...a),
      ...createWhatIfSlice(client)(...a),
      ...createImportSlice(client)(...a),
      ...createInsightSlice(client)(...a),
      ...createPicturesSlice(client)(...a),
      ...createPlannerSlice(client)(...a),
    };
    // Each slice's first state object: updates are immutable (a new object each time), so these stay as built.
    const { curation, models, whatif, importer, insight, pictures, planner } = slices;
    return {
      ...slices,
      forgetWorkspaceState() {
        epoch += 1;
        a[0]({ curation, models, whatif, importer, insight, pictures, planner });
      },
    };
  });
}

export const StoreContext = createContext<AppStore | null>(null);

/** Select the least (guides/prevent-rerenders-with-use-shallow.md): callers pass a narrow selector. */
export function useApp<T>(selector: (s: AppState) => T): T {
  const store = useContext(StoreContext);
  if (!store) throw new Error('useApp outside <StoreContext.Provider>');
  return useStore(store, selector);
}
