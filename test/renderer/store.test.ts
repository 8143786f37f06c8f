import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ApiCallError, createClient, describeError } from '../../src-renderer/client/client.ts';
import { createAppStore, type AppStore } from '../../src-renderer/state/store.ts';
import { seededHarness, type Harness } from './seed.ts';

let h: Harness;
let store: AppStore;
beforeEach(() => {
  h = seededHarness();
  store = createAppStore(h.client, () => 1000);
});
afterEach(() => h.close());

describe('workspace slice', () => {
  it('loads the real counts through the client', async () => {
    await store.getState().loadWorkspace();
    const w = store.getState().workspace;
    expect(w.status).toBe('ready');
    expect(w.info).toMatchObject({ open: true, file: h.file, items: 12, customers: 6, signals: 30 });
    expect(w.readAt).toBe(1000);
  });

  it('keeps the open workspace and explains when another file cannot be opened', async () => {
    await store.getState().loadWorkspace();
    const ok = await store.getState().openWorkspace(`${h.dir}/missing.sqlite`, false);
    expect(ok).toBe(false);
    expect(store.getState().workspace.openError).toBe(`no workspace at ${h.dir}/missing.sqlite`);
    expect(store.getState().workspace.info?.items).toBe(12);
  });
});

describe('curation slice', () => {
  it('starts an edition, adds a filled shelf and lists the edition', async () => {
    const s = store.getState();
    expect(await s.newEdition('Week 49', '2026-12-07')).toBe(true);
    expect(await store.getState().addShelf('Homepage row', { size: 5 })).toBe(true);
    const c = store.getState().curation;
    expect(c.editions.map((e) => e.label)).toEqual(['Week 49']);
    expect(c.edition?.shelves).toHaveLength(1);
    expect(c.edition?.shelves[0]?.slots.filter((x) => x.item !== null)).toHaveLength(5);
  });

  it('pins, then undoes, and the open edition follows each step', async () => {
    await store.getState().newEdition('Week 49', '2026-12-07');
    await store.getState().addShelf('Row', { size: 4 });
    store.getState().openShelf('Row');
    const first = store.getState().curation.edition?.shelves[0]?.slots[2];
    expect(first?.item).toBeTruthy();
    expect(await store.getState().act({ kind: 'pin', slot: 3, item: first?.item as string })).toBe(true);
    expect(store.getState().curation.edition?.shelves[0]?.slots[2]?.pinned).toBe(true);
    expect(store.getState().curation.edition?.shelves[0]?.canUndo).toBe(true);
    await store.getState().undo();
    expect(store.getState().curation.edition?.shelves[0]?.slots[2]?.pinned).toBe(false);
    expect(store.getState().curation.lastActionMs).toBe(0);
  });

  it('puts an api error in the area where the editor acted, and clears it on the next try', async () => {
    await store.getState().newEdition('Week 49', '2026-12-07');
    expect(await store.getState().newEdition('Week 49', '2026-12-08')).toBe(false);
    expect(store.getState().curation.errors.new).toMatch(/Week 49/);
    expect(store.getState().curation.errors.shelf).toBeUndefined();
    expect(await store.getState().newEdition('Week 50', '2026-12-14')).toBe(true);
    expect(store.getState().curation.errors.new).toBeUndefined();
  });

  it('refuses an action on a missing item with an input error, leaving the shelf as it was', async () => {
    await store.getState().newEdition('W', '2026-12-07');
    await store.getState().addShelf('Row', { size: 3 });
    store.getState().openShelf('Row');
    const before = store.getState().curation.edition?.shelves[0]?.slots.map((x) => x.item);
    expect(await store.getState().act({ kind: 'pin', slot: 1, item: 'no-such-item' })).toBe(false);
    expect(store.getState().curation.errors.shelf).toMatch(/no-such-item/);
    expect(store.getState().curation.edition?.shelves[0]?.slots.map((x) => x.item)).toEqual(before);
  });
});

describe('client', () => {
  it('turns a failed result into ApiCallError and a dead transport into plain advice', async () => {
    const failing = createClient(async () => ({ ok: false, error: { code: 'input', message: 'bad', where: { file: 'a.csv', line: 3, column: 'price' } } }));
    const e = await failing.call('workspace.info', {}).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(ApiCallError);
    expect(describeError(e)).toBe('a.csv:3:price: bad');
    const dead = createClient(async () => {
      throw new Error('fetch failed');
    });
    expect(describeError(await dead.call('workspace.info', {}).catch((x: unknown) => x))).toMatch(/not answering \(fetch failed\).*reload/);
  });

  it('refuses a method the contract does not have before sending anything', async () => {
    let sent = 0;
    const c = createClient(async () => {
      sent++;
      return { ok: true, value: null };
    });
    await expect(c.call('nope' as 'workspace.info', {})).rejects.toThrow('unknown method: nope');
    expect(sent).toBe(0);
  });
});
