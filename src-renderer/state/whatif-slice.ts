import type { StateCreator } from 'zustand';
import type { ResponseOf } from '../../src-main/api/contract.ts';
import { describeError, type Client } from '../client/client.ts';
import type { AppState } from './store.ts';

export type WhatIf = ResponseOf<'shelf.whatif'>;
export type WhatIfCandidate = WhatIf['candidates'][number];

export interface WhatIfSlice {
  whatif: {
    /** `edition/shelf/slot` the candidates were computed for. */
    key: string | null;
    result: WhatIf | null;
    loading: boolean;
    error: string | null;
    /** The candidate under the pointer or keyboard focus: the meter shows its deltas. */
    focus: string | null;
  };
  loadWhatIf(slot: number, n?: number): Promise<void>;
  focusCandidate(item: string | null): void;
}

export function createWhatIfSlice(client: Client): StateCreator<AppState, [], [], WhatIfSlice> {
  // Only the latest request may land: an earlier one (another slot, or this slot before an action) can answer last.
  let latest = 0;
  return (set, get) => ({
    whatif: { key: null, result: null, loading: false, error: null, focus: null },
    async loadWhatIf(slot, n = 200) {
      const c = get().curation;
      if (!c.edition || !c.shelf) return;
      const key = `${c.edition.label}/${c.shelf}/${slot}`;
      const ticket = ++latest;
      // Another slot's candidates are not shown under this slot while its own are ranked.
      set((s) => ({ whatif: { ...s.whatif, key, result: s.whatif.key === key ? s.whatif.result : null, loading: true, error: null } }));
      try {
        const result = await client.call('shelf.whatif', { edition: c.edition.label, shelf: c.shelf, slot, n });
        if (ticket === latest) set((s) => ({ whatif: { ...s.whatif, result, loading: false } }));
      } catch (e) {
        if (ticket === latest) set((s) => ({ whatif: { ...s.whatif, result: null, loading: false, error: describeError(e) } }));
      }
    },
    focusCandidate(item) {
      set((s) => ({ whatif: { ...s.whatif, focus: item } }));
    },
  });
}
