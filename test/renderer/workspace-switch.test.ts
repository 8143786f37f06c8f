import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { ModelInfo } from '../../src-renderer/state/models-slice.ts';
import { createAppStore, type AppStore } from '../../src-renderer/state/store.ts';
import { seededHarness, type Harness } from './seed.ts';

let h: Harness;
let store: AppStore;
beforeEach(() => {
  h = seededHarness();
  store = createAppStore(h.client, () => 1000);
});
afterEach(() => h.close());

/** Fills every screen's state from the seeded workspace: editions, a comparison, messages, a search. */
async function useTheSeededWorkspace(s: AppStore): Promise<void> {
  await s.getState().loadWorkspace();
  await s.getState().newEdition('Week 49', '2026-12-07');
  await s.getState().addShelf('Row', { size: 4 });
  await s.getState().publish();
  await s.getState().newEdition('Week 50', '2026-12-14', 'Week 49');
  await s.getState().publish();
  await s.getState().compare('Week 49', 'Week 50');
  await s.getState().newEdition('Week 49', '2026-12-21'); // refused: the label is taken, a message shows
  await s.getState().searchItems('Quiet');
  s.setState({ pictures: { byItem: { 'i-1': 'data:image/webp;base64,UklGRg==' } } }); // a thumbnail of this workspace
  // The seeded workspace has no trained models; the list a training run leaves is stood in for here.
  s.setState((st) => ({ models: { ...st.models, list: Array.from({ length: 5 }, (_, i) => ({ ...stubModel, kind: `m${i}` })) }, importer: { ...st.importer, error: 'an old import message' } }));
}
/** Only what the overview reads of a model (its count and staleness); the rest does not matter here. */
const stubModel = { kind: 'ials', stale: false } as unknown as ModelInfo;

describe('opening another workspace', () => {
  it('clears every screen: no models, editions, comparison or messages of the previous workspace remain', async () => {
    await useTheSeededWorkspace(store);
    const before = store.getState();
    expect(before.curation.comparison?.b).toBe('Week 50');
    expect(before.curation.editions).toHaveLength(2);
    expect(before.curation.errors.new).toMatch(/Week 49/);
    expect(before.insight.search.length).toBeGreaterThan(0);
    expect(before.models.list).toHaveLength(5);

    expect(await store.getState().openWorkspace(path.join(h.dir, 'empty.sqlite'), true)).toBe(true);
    const after = store.getState();
    expect(after.workspace.info).toMatchObject({ open: true, items: 0, signals: 0 });
    expect(after.curation).toMatchObject({ editions: [], edition: null, shelf: null, comparison: null, errors: {}, lastChange: null });
    expect(after.models.list).toEqual([]);
    expect(after.models.job).toBeNull();
    expect(after.insight.search).toEqual([]);
    expect(after.insight.errors).toEqual({});
    expect(after.importer.error).toBeNull();
    expect(after.whatif.result).toBeNull();
    expect(after.pictures.byItem).toEqual({}); // the new workspace's item i-1 is another item
    // What the screens then read comes from the new workspace.
    await store.getState().loadModels();
    await store.getState().loadEditions();
    expect(store.getState().models.list).toEqual([]);
    expect(store.getState().curation.editions).toEqual([]);
  });

  it('keeps every screen as it was when the other file cannot be opened', async () => {
    await useTheSeededWorkspace(store);
    expect(await store.getState().openWorkspace(path.join(h.dir, 'missing.sqlite'), false)).toBe(false);
    expect(store.getState().curation.comparison?.b).toBe('Week 50');
    expect(store.getState().models.list).toHaveLength(5);
  });
});

describe('an answer about the previous workspace', () => {
  it('is dropped when it arrives after another workspace was opened', async () => {
    let release: () => void = () => {};
    const gate = new Promise<void>((r) => (release = r));
    let asked = false;
    // The comparison's answer is held until the new workspace is open, as a slow call over IPC or HTTP would be.
    const held: typeof h.client = {
      ...h.client,
      async call(method, payload) {
        const answer = await h.client.call(method, payload);
        if (method === 'edition.compare') {
          asked = true;
          await gate;
        }
        return answer;
      },
    };
    store = createAppStore(held, () => 1000);
    await store.getState().newEdition('Week 49', '2026-12-07');
    await store.getState().publish();
    void store.getState().compare('Week 49', 'Week 49');
    await vi.waitFor(() => expect(asked).toBe(true));
    expect(await store.getState().openWorkspace(path.join(h.dir, 'empty.sqlite'), true)).toBe(true);
    release();
    // The held answer is dropped: the compare call never settles, so wait on the gate's next turn instead.
    await gate;
    await new Promise((r) => setImmediate(r));
    expect(store.getState().curation.comparison).toBeNull();
    expect(store.getState().curation.busy).toBe(false);
  });
});
