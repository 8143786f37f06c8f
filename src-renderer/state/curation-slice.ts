import type { StateCreator } from 'zustand';
import type { RequestOf, ResponseOf } from '../../src-main/api/contract.ts';
import { describeError, type Client } from '../client/client.ts';
import { shelfKey } from './publish-check.ts';
import type { AppState } from './store.ts';

export type EditionView = ResponseOf<'edition.show'>;
export type ShelfView = EditionView['shelves'][number];
export type EditionSummary = ResponseOf<'edition.list'>['editions'][number];
export type ShelfAction = RequestOf<'shelf.act'>['action'];
export type Brief = RequestOf<'shelf.add'>['brief'];
export type ExportFormat = RequestOf<'edition.export'>['format'];
export type Comparison = ResponseOf<'edition.compare'>;
/** The catalogue's categories, suppliers and tags: the choices a limit, a filter or a ban offers. */
export type CatalogueNames = ResponseOf<'catalogue.names'>;
export type ExportResult = ResponseOf<'edition.export'>;
export type ShelfChanges = NonNullable<ResponseOf<'shelf.act'>['changes']>;
export interface LastChange {
  edition: string;
  shelf: string;
  changes: ShelfChanges;
  /** Predicted relevance a refill would have over the kept list; null after a refill. */
  relevanceGivenUp: number | null;
}

/** Where an error is shown: beside the control the editor used. */
export type ErrorArea = 'list' | 'new' | 'board' | 'addShelf' | 'shelf' | 'brief' | 'ban' | 'names' | 'targets' | 'publish' | 'export' | 'compare';

export interface CurationSlice {
  curation: {
    editions: EditionSummary[];
    edition: EditionView | null;
    /** Label of the shelf open in the editor. */
    shelf: string | null;
    busy: boolean;
    errors: Partial<Record<ErrorArea, string>>;
    exported: ExportResult | null;
    comparison: Comparison | null;
    /** Round trip of the last editorial action, for the status line (DESIGN.md target: under 100 ms). */
    lastActionMs: number | null;
    /** What the last action, undo, redo or refill changed on which shelf: the editor highlights and says it. */
    lastChange: LastChange | null;
    /** Shelves opened in the shelf editor (`shelfKey`), so publishing can name the ones never opened. */
    opened: string[];
    /** The catalogue's names, read once per workspace when a brief form first needs them. */
    names: CatalogueNames | null;
  };
  loadNames(): Promise<void>;
  loadEditions(): Promise<void>;
  newEdition(label: string, date: string, from?: string): Promise<boolean>;
  openEdition(label: string): Promise<boolean>;
  addShelf(label: string, brief: Brief): Promise<boolean>;
  openShelf(label: string | null): void;
  act(action: ShelfAction, reason?: string): Promise<boolean>;
  undo(): Promise<void>;
  redo(): Promise<void>;
  refill(): Promise<void>;
  setBrief(brief: Brief): Promise<boolean>;
  /** A ban on a category, supplier or tag with its scope (shown beside the ban form, not the slots). */
  banRule(facet: 'category' | 'supplier' | 'tag', value: string, scope: string): Promise<boolean>;
  /** The meter's target bands on the open shelf's brief ({} = every reading back to its default band). */
  setTargets(targets: RequestOf<'shelf.targets'>['targets']): Promise<boolean>;
  publish(): Promise<boolean>;
  exportEdition(format: ExportFormat): Promise<ExportResult | null>;
  compare(a: string, b: string): Promise<void>;
  clearError(area: ErrorArea): void;
}

export const initialCuration: CurationSlice['curation'] = {
  editions: [],
  edition: null,
  shelf: null,
  busy: false,
  errors: {},
  exported: null,
  comparison: null,
  lastActionMs: null,
  lastChange: null,
  opened: [],
  names: null,
};

/** The edition with one shelf replaced (immutable update: zustand guides/maps-and-sets-usage.md). */
function withShelf(e: EditionView, s: ShelfView): EditionView {
  return { ...e, shelves: e.shelves.map((x) => (x.label === s.label ? s : x)) };
}

export function createCurationSlice(client: Client, clock: () => number): StateCreator<AppState, [], [], CurationSlice> {
  return (set, get) => {
    const fail = (area: ErrorArea, e: unknown) =>
      set((s) => ({ curation: { ...s.curation, busy: false, errors: { ...s.curation.errors, [area]: describeError(e) } } }));
    const start = (area: ErrorArea) =>
      set((s) => {
        const errors = { ...s.curation.errors };
        delete errors[area];
        return { curation: { ...s.curation, busy: true, errors } };
      });
    const patch = (p: Partial<CurationSlice['curation']>) => set((s) => ({ curation: { ...s.curation, busy: false, ...p } }));
    const refs = () => {
      const c = get().curation;
      if (!c.edition || !c.shelf) throw new Error('Open a shelf first.');
      return { edition: c.edition.label, shelf: c.shelf };
    };
    /**
     * Applies a shelf change, then re-reads the edition so its meter (overlaps, Gini) follows. The slice stays
     * busy until that re-read is in: a move names slots by position, so the next one may only start from the
     * order the store holds (a keyboard move pressed while one is in flight would act on a stale order).
     */
    const shelfChanged = async (s: ResponseOf<'shelf.act'>, t0: number) => {
      const e = get().curation.edition;
      const lastChange = s.changes ? { edition: s.edition, shelf: s.label, changes: s.changes, relevanceGivenUp: s.relevanceGivenUp ?? null } : null;
      if (e) set((st) => ({ curation: { ...st.curation, edition: withShelf(e, s), lastActionMs: clock() - t0, lastChange } }));
      try {
        const fresh = await client.call('edition.show', { edition: s.edition });
        if (get().curation.edition?.label === fresh.label) patch({ edition: fresh });
        else patch({});
      } catch {
        // The shelf is already current; a stale edition meter is refreshed on the next action.
        patch({});
      }
    };
    const shelfCall = async (area: ErrorArea, call: () => Promise<ResponseOf<'shelf.act'>>): Promise<boolean> => {
      start(area);
      const t0 = clock();
      try {
        await shelfChanged(await call(), t0);
        return true;
      } catch (e) {
        fail(area, e);
        return false;
      }
    };

    return {
      curation: initialCuration,
      async loadEditions() {
        start('list');
        try {
          const { editions } = await client.call('edition.list', {});
          patch({ editions });
        } catch (e) {
          fail('list', e);
        }
      },
      async newEdition(label, date, from) {
        start('new');
        try {
          const edition = await client.call('edition.new', from ? { label, date, from } : { label, date });
          patch({ edition, shelf: null, exported: null });
          await get().loadEditions();
          return true;
        } catch (e) {
          fail('new', e);
          return false;
        }
      },
      async openEdition(label) {
        start('board');
        try {
          const edition = await client.call('edition.show', { edition: label });
          patch({ edition, shelf: null, exported: null });
          return true;
        } catch (e) {
          fail('board', e);
          return false;
        }
      },
      async addShelf(label, brief) {
        const e = get().curation.edition;
        if (!e) return false;
        start('addShelf');
        try {
          await client.call('shelf.add', { edition: e.label, label, brief });
          patch({ edition: await client.call('edition.show', { edition: e.label }) });
          return true;
        } catch (err) {
          fail('addShelf', err);
          return false;
        }
      },
      openShelf(label) {
        set((s) => {
          const key = label && s.curation.edition ? shelfKey(s.curation.edition.label, label) : null;
          const opened = key && !s.curation.opened.includes(key) ? [...s.curation.opened, key] : s.curation.opened;
          return { curation: { ...s.curation, shelf: label, lastChange: null, opened } };
        });
      },
      act: (action, reason) => shelfCall('shelf', () => client.call('shelf.act', { ...refs(), action, ...(reason ? { reason } : {}) })),
      undo: async () => void (await shelfCall('shelf', () => client.call('shelf.undo', refs()))),
      redo: async () => void (await shelfCall('shelf', () => client.call('shelf.redo', refs()))),
      refill: async () => void (await shelfCall('shelf', () => client.call('shelf.fill', refs()))),
      setBrief: (brief) => shelfCall('brief', () => client.call('shelf.brief', { ...refs(), brief })),
      banRule: (facet, value, scope) => shelfCall('ban', () => client.call('shelf.act', { ...refs(), action: { kind: 'banRule', facet, value, scope } })),
      async loadNames() {
        try {
          const names = await client.call('catalogue.names', {});
          set((s) => ({ curation: { ...s.curation, names } }));
        } catch (e) {
          set((s) => ({ curation: { ...s.curation, errors: { ...s.curation.errors, names: describeError(e) } } }));
        }
      },
      setTargets: (targets) => shelfCall('targets', () => client.call('shelf.targets', { ...refs(), targets })),
      async publish() {
        const e = get().curation.edition;
        if (!e) return false;
        start('publish');
        try {
          await client.call('edition.publish', { edition: e.label });
          patch({ edition: await client.call('edition.show', { edition: e.label }) });
          await get().loadEditions();
          return true;
        } catch (err) {
          fail('publish', err);
          return false;
        }
      },
      async exportEdition(format) {
        const e = get().curation.edition;
        if (!e) return null;
        start('export');
        try {
          const exported = await client.call('edition.export', { edition: e.label, format });
          patch({ exported });
          return exported;
        } catch (err) {
          fail('export', err);
          return null;
        }
      },
      async compare(a, b) {
        start('compare');
        try {
          patch({ comparison: await client.call('edition.compare', { a, b }) });
        } catch (e) {
          fail('compare', e);
        }
      },
      clearError(area) {
        set((s) => {
          const errors = { ...s.curation.errors };
          delete errors[area];
          return { curation: { ...s.curation, errors } };
        });
      },
    };
  };
}
