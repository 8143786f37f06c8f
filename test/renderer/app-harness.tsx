import { cleanup, render, type RenderResult } from '@testing-library/react';
import { afterEach, beforeEach } from 'vitest';
import { App } from '../../src-renderer/App.tsx';
import { createAppStore, StoreContext, type AppStore } from '../../src-renderer/state/store.ts';
import { seededHarness, type Harness } from './seed.ts';

/** The whole app over a fresh seeded workspace for each test: its harness, its store, and a render of <App/>. */
export interface SeededApp {
  readonly h: Harness;
  /** Replaceable: a test may give the app a store over another client before it renders. */
  store: AppStore;
  render(): RenderResult;
}

/** Registers the per-test set-up and clean-up in the calling file; read `h` and `store` inside tests only. */
export function seededApp(): SeededApp {
  let h: Harness | undefined;
  let store: AppStore | undefined;
  beforeEach(() => {
    h = seededHarness();
    store = createAppStore(h.client);
  });
  afterEach(() => {
    cleanup();
    h?.close();
  });
  return {
    get h() {
      return h!;
    },
    get store() {
      return store!;
    },
    set store(s: AppStore) {
      store = s;
    },
    render() {
      return render(
        <StoreContext.Provider value={store!}>
          <App />
        </StoreContext.Provider>,
      );
    },
  };
}
