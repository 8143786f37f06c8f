import type { StateCreator } from 'zustand';
import type { RequestOf, ResponseOf } from '../../src-main/api/contract.ts';
import { ApiCallError, describeError, type Client } from '../client/client.ts';
import type { AppState } from './store.ts';

export type HoldoutResult = ResponseOf<'evaluate.holdout'>;
export type Backtest = ResponseOf<'shelf.backtest'>;
export type Similar = ResponseOf<'item.similar'>;
export type ItemRef = ResponseOf<'item.search'>['items'][number];
export type Proposal = ResponseOf<'propose'>;
export type AudienceGroups = ResponseOf<'audience.groups'>;
export type Forgotten = ResponseOf<'customer.forget'>;
export type ProposeRequest = RequestOf<'propose'>;

/** Where each read-only look-up shows its result and its error: beside the control that asked for it. */
export type InsightArea = 'holdout' | 'backtest' | 'similar' | 'search' | 'propose' | 'groups' | 'forget';

export interface InsightSlice {
  insight: {
    holdout: HoldoutResult | null;
    backtest: Backtest | null;
    /** `edition/shelf` the backtest was run for: another shelf's figures are never shown. */
    backtestFor: string | null;
    similar: Similar | null;
    search: ItemRef[];
    proposal: Proposal | null;
    groups: AudienceGroups | null;
    forgotten: Forgotten | null;
    busy: Partial<Record<InsightArea, boolean>>;
    errors: Partial<Record<InsightArea, string>>;
  };
  evaluateHoldout(fileName: string, content: string, k: number): Promise<void>;
  runBacktest(windowDays: number): Promise<void>;
  loadSimilar(item: string): Promise<void>;
  searchItems(query: string): Promise<void>;
  proposeWith(req: ProposeRequest): Promise<void>;
  loadGroups(): Promise<void>;
  /** Changes the range the number of groups is chosen in, or the history needed (saved for the workspace). */
  setGroupSettings(settings: RequestOf<'audience.settings'>): Promise<boolean>;
  /** Names a group, or removes a name (`group` null). */
  nameGroup(group: number | null, name: string): Promise<boolean>;
  forgetCustomer(customer: string): Promise<boolean>;
}

export function createInsightSlice(client: Client): StateCreator<AppState, [], [], InsightSlice> {
  return (set, get) => {
    type I = InsightSlice['insight'];
    /** Runs one call for an area: busy while it runs, the error (or none) after, the result stored by `put`. */
    const run = async <T>(area: InsightArea, call: () => Promise<T>, put: (v: T) => Partial<I>, describe = describeError): Promise<boolean> => {
      set((s) => {
        const errors = { ...s.insight.errors };
        delete errors[area];
        return { insight: { ...s.insight, errors, busy: { ...s.insight.busy, [area]: true } } };
      });
      try {
        const v = await call();
        set((s) => ({ insight: { ...s.insight, ...put(v), busy: { ...s.insight.busy, [area]: false } } }));
        return true;
      } catch (e) {
        set((s) => ({ insight: { ...s.insight, errors: { ...s.insight.errors, [area]: describe(e) }, busy: { ...s.insight.busy, [area]: false } } }));
        return false;
      }
    };
    const shelfRef = () => {
      const c = get().curation;
      if (!c.edition || !c.shelf) throw new Error('Open a shelf first.');
      return { edition: c.edition.label, shelf: c.shelf };
    };
    return {
      insight: { holdout: null, backtest: null, backtestFor: null, similar: null, search: [], proposal: null, groups: null, forgotten: null, busy: {}, errors: {} },
      evaluateHoldout: async (fileName, content, k) =>
        void (await run('holdout', () => client.call('evaluate.holdout', { source: { fileName, content }, k }), (holdout) => ({ holdout }))),
      async runBacktest(windowDays) {
        const ref = shelfRef();
        await run('backtest', () => client.call('shelf.backtest', { ...ref, windowDays }), (backtest) => ({ backtest, backtestFor: `${ref.edition}/${ref.shelf}` }));
      },
      loadSimilar: async (item) => void (await run('similar', () => client.call('item.similar', { item, n: 8 }), (similar) => ({ similar }))),
      searchItems: async (query) =>
        void (await run('search', () => client.call('item.search', { query, limit: 12 }), (r) => ({ search: r.items }))),
      proposeWith: async (req) => void (await run('propose', () => client.call('propose', req), (proposal) => ({ proposal }))),
      loadGroups: async () => void (await run('groups', () => client.call('audience.groups', {}), (groups) => ({ groups }))),
      setGroupSettings: (settings) => run('groups', () => client.call('audience.settings', settings), (groups) => ({ groups })),
      nameGroup: (group, name) =>
        run('groups', () => client.call('audience.name', group === null ? { remove: name } : { group, name }), (groups) => ({ groups })),
      async forgetCustomer(customer) {
        // An unknown id is the editor's typo, not a vanished record: say so without the generic "refresh".
        const typo = (e: unknown) => (e instanceof ApiCallError && e.code === 'not_found' ? `${e.message}.` : describeError(e));
        const ok = await run('forget', () => client.call('customer.forget', { customer }), (forgotten) => ({ forgotten }), typo);
        // Counts and model staleness follow the erasure.
        if (ok) await Promise.all([get().loadWorkspace(), get().loadModels()]);
        return ok;
      },
    };
  };
}
