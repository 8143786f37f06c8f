import { afterAll, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { InputError } from '../../src-main/core/errors.ts';
import { MIGRATIONS } from '../../src-main/store/migrations/index.ts';
import { FINGERPRINT_KIND_TERM } from '../../src-main/store/models.ts';
import { openWorkspace, userVersion } from '../../src-main/store/workspace.ts';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-migrate-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('workspace schema versions', () => {
  it('upgrades a version-1 file to the current schema and keeps its data', () => {
    const file = path.join(dir, 'v1.shelf');
    const v1 = openWorkspace(file, { migrations: MIGRATIONS.slice(0, 1) });
    expect(userVersion(v1)).toBe(1);
    v1.prepare("INSERT INTO item (external_id, title, tags) VALUES ('b1', 'Moss Lantern', '[\"night\"]')").run();
    v1.prepare("INSERT INTO customer (external_id) VALUES ('r1')").run();
    v1.prepare("INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES (1, 1, 'view', 1, 1773480413000)").run();
    v1.close();

    const now = openWorkspace(file);
    expect(userVersion(now)).toBe(MIGRATIONS.length);
    expect(now.prepare('SELECT external_id, title, tags FROM item').all()).toEqual([{ external_id: 'b1', title: 'Moss Lantern', tags: '["night"]' }]);
    // Migration 004 stores the kind as a code named in signal_kind, and keeps the row id.
    expect(now.prepare('SELECT s.id, customer_id, item_id, k.name AS kind, value, at FROM signal s JOIN signal_kind k ON k.code = s.kind').all()).toEqual([
      { id: 1, customer_id: 1, item_id: 1, kind: 'view', value: 1, at: 1_773_480_413_000 },
    ]);
    expect(now.prepare("SELECT name FROM sqlite_master WHERE type = 'index' AND tbl_name = 'signal'").pluck().all()).toEqual(['signal_identity']);
    expect(now.pragma('integrity_check', { simple: true })).toBe('ok');
    now.close();
  });

  it('keeps the data fingerprint across schema 4, so models trained before it stay current', () => {
    const file = path.join(dir, 'v3.shelf');
    const v3 = openWorkspace(file, { migrations: MIGRATIONS.slice(0, 3) });
    v3.prepare("INSERT INTO item (external_id, title) VALUES ('b1', 'Moss Lantern'), ('b2', 'Fern Tray')").run();
    v3.prepare("INSERT INTO customer (external_id) VALUES ('r1'), ('r2')").run();
    const add = v3.prepare('INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES (?, ?, ?, ?, ?)');
    ['view', 'basket', 'purchase', 'rating', 'read', 'click', 'other'].forEach((kind, i) => add.run(1 + (i % 2), 1 + (i % 2), kind, i + 1, i === 3 ? null : 1_773_480_413_000 + i));
    // The fingerprint's kind term as computed before schema 4, on text kinds.
    const before = v3.prepare('SELECT total(length(kind) * 128 + unicode(kind)) FROM signal').pluck().get();
    v3.close();
    const now = openWorkspace(file);
    // Its other terms (counts, ids, times, values, pairs, items) read columns schema 4 copies unchanged.
    expect(now.prepare(`SELECT total(${FINGERPRINT_KIND_TERM}) FROM signal`).pluck().get()).toBe(before);
    // Every kind kept its name through the code.
    expect(now.prepare('SELECT k.name FROM signal s JOIN signal_kind k ON k.code = s.kind ORDER BY s.id').pluck().all()).toEqual([
      'view', 'basket', 'purchase', 'rating', 'read', 'click', 'other',
    ]);
    now.close();
  });

  it('refuses a file written by a newer program, naming both versions', () => {
    const file = path.join(dir, 'future.shelf');
    openWorkspace(file).close();
    const raw = new Database(file);
    raw.pragma(`user_version = ${MIGRATIONS.length + 1}`);
    raw.close();
    expect(() => openWorkspace(file)).toThrow(InputError);
    expect(() => openWorkspace(file)).toThrow(new RegExp(`newer Shelfwright \\(schema ${MIGRATIONS.length + 1}; this one knows ${MIGRATIONS.length}\\)`));
  });

  it('refuses an SQLite file that is not a workspace and leaves it untouched', () => {
    const file = path.join(dir, 'other.db');
    const raw = new Database(file);
    raw.exec('CREATE TABLE invoices (n INTEGER)');
    raw.close();
    expect(() => openWorkspace(file)).toThrow(/not a Shelfwright workspace/);
    const check = new Database(file);
    expect(check.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").pluck().all()).toEqual(['invoices']);
    check.close();
  });

  it('refuses another program’s database that sets a user_version of its own, and leaves every byte as it was', () => {
    const file = path.join(dir, 'other-versioned.db');
    const raw = new Database(file);
    raw.exec('CREATE TABLE settings (k TEXT, v TEXT); PRAGMA user_version = 2;');
    raw.close();
    const bytes = fs.readFileSync(file);
    expect(() => openWorkspace(file)).toThrow(/not a Shelfwright workspace: the file holds other tables/);
    expect(fs.readFileSync(file).equals(bytes)).toBe(true);
  });

  it('refuses a file that is not SQLite at all', () => {
    const file = path.join(dir, 'notes.shelf');
    fs.writeFileSync(file, 'these are my shelf notes, not a database\n'.repeat(200));
    // SQLite reports SQLITE_NOTADB on the first read; openWorkspace turns it into the user's error.
    expect(() => openWorkspace(file)).toThrow(InputError);
    expect(() => openWorkspace(file)).toThrow('not a workspace file (not an SQLite database)');
    expect(fs.readFileSync(file, 'utf8')).toMatch(/^these are my shelf notes/);
  });
});
