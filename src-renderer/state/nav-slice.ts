import type { StateCreator } from 'zustand';
import type { AppState } from './store.ts';

/** The screens. Board and shelf need an open edition (and shelf); App hides them until then. */
export type ScreenId = 'overview' | 'import' | 'models' | 'groups' | 'editions' | 'board' | 'shelf' | 'history' | 'planner';

export interface NavSlice {
  nav: { screen: ScreenId };
  go(screen: ScreenId): void;
}

export const createNavSlice: StateCreator<AppState, [], [], NavSlice> = (set) => ({
  nav: { screen: 'overview' },
  go(screen) {
    set({ nav: { screen } });
  },
});
