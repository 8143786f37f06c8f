/**
 * Workspaces hold customer data, so their files are private to the user who made them (DESIGN.md: "workspaces
 * are private files (0600)"). Found in a review: new workspaces were created 0644, readable by every local
 * user. Modes are checked under a umask that removes nothing (0), so the modes come from the code, not from a
 * kind default umask; 0600 / 0700 are the owner-only modes of POSIX chmod.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { afterAll, afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildDemoWorkspace } from '../../src-main/services/demo.ts';
import { withFile } from '../../src-main/services/staged-file.ts';
import { UploadStore } from '../../src-main/services/uploads.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-private-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const mode = (f: string) => fs.statSync(f).mode & 0o777;

let umask = 0;
beforeEach(() => {
  umask = process.umask(0);
});
afterEach(() => {
  process.umask(umask);
});

describe.skipIf(process.platform === 'win32')('private files', () => {
  it('creates a workspace 0600, in a new folder 0700, and the -wal and -shm SQLite makes beside it 0600 too', () => {
    const file = path.join(dir, 'new-folder', 'shop.sqlite');
    const db = openWorkspace(file);
    try {
      db.prepare("INSERT INTO customer (external_id) VALUES ('C-1')").run(); // a write, so the log has frames
      expect(mode(path.dirname(file))).toBe(0o700);
      expect(mode(file)).toBe(0o600);
      expect(mode(`${file}-wal`)).toBe(0o600);
      expect(mode(`${file}-shm`)).toBe(0o600);
    } finally {
      db.close();
    }
  });

  it('makes an older, world-readable workspace private when it is opened for writing', () => {
    const file = path.join(dir, 'old.sqlite');
    openWorkspace(file).close();
    fs.chmodSync(file, 0o644);
    const db = openWorkspace(file);
    try {
      expect(mode(file)).toBe(0o600);
      db.prepare("INSERT INTO customer (external_id) VALUES ('C-1')").run();
      expect(mode(`${file}-wal`)).toBe(0o600);
    } finally {
      db.close();
    }
  });

  it("leaves the mode of a file that is not a workspace alone when it refuses to open it", () => {
    const file = path.join(dir, 'notes.txt');
    fs.writeFileSync(file, 'a shopping list, not a database\n', { mode: 0o644 });
    expect(() => openWorkspace(file)).toThrow(/not a workspace file/);
    expect(mode(file)).toBe(0o644);
  });

  it('builds the demo workspace 0600 (built beside the target, then renamed into place)', async () => {
    const file = path.join(dir, 'demo.sqlite');
    await buildDemoWorkspace(file, { size: { items: 60, customers: 80, signals: 800 }, train: false });
    expect(mode(file)).toBe(0o600);
  });

  it('keeps uploads in 0700 folders as 0600 files, and content sent inside a request likewise', async () => {
    const parent = fs.mkdtempSync(path.join(dir, 'uploads-'));
    const store = new UploadStore(parent);
    try {
      const up = await store.receive('signals.csv', Readable.from([Buffer.from('customer,item\nC-1,A\n')]), 1000);
      expect(mode(store.folder!)).toBe(0o700);
      expect(mode(path.dirname(up.path))).toBe(0o700);
      expect(mode(up.path)).toBe(0o600);
    } finally {
      store.close();
    }
    const seen = await withFile({ fileName: 'signals.csv', content: 'customer,item\nC-1,A\n' }, async (file) => [mode(path.dirname(file)), mode(file)]);
    expect(seen).toEqual([0o700, 0o600]);
  });
});
