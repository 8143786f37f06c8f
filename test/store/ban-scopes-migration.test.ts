import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { MIGRATIONS } from '../../src-main/store/migrations/index.ts';
import { banScopes } from '../../src-main/store/migrations/008-ban-scopes.ts';
import { openWorkspace, userVersion } from '../../src-main/store/workspace.ts';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-ban-scopes-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** Schema 8 rebuilds the ban table with two more scopes (SQLite cannot change a CHECK in place). */
describe('ban scopes migration', () => {
  it('keeps every ban of an older workspace, and then takes later and until-a-date scopes but nothing else', () => {
    const file = path.join(dir, 'v7.shelf');
    const at = MIGRATIONS.indexOf(banScopes);
    const old = openWorkspace(file, { migrations: MIGRATIONS.slice(0, at) });
    old.exec(`
      INSERT INTO item (external_id, title) VALUES ('b1', 'Moss Lantern');
      INSERT INTO edition (label, date, created_at) VALUES ('w', '2026-03-02', 0);
      INSERT INTO shelf (edition_id, position, label, size, brief) VALUES (1, 0, 'Front', 4, '{"size":4}');
      INSERT INTO ban (shelf_id, edition_id, scope, item_id) VALUES (1, 1, 'edition', 1);
      INSERT INTO ban (shelf_id, edition_id, scope, facet, value) VALUES (1, 1, 'always', 'category', 'kites');
    `);
    expect(() => old.prepare("INSERT INTO ban (shelf_id, edition_id, scope, item_id) VALUES (1, 1, 'later', 1)").run()).toThrow(/CHECK/);
    old.close();

    const now = openWorkspace(file);
    expect(userVersion(now)).toBe(MIGRATIONS.length);
    expect(now.prepare('SELECT id, shelf_id, edition_id, scope, item_id, facet, value FROM ban ORDER BY id').all()).toEqual([
      { id: 1, shelf_id: 1, edition_id: 1, scope: 'edition', item_id: 1, facet: null, value: null },
      { id: 2, shelf_id: 1, edition_id: 1, scope: 'always', item_id: null, facet: 'category', value: 'kites' },
    ]);
    const add = (scope: string) => now.prepare('INSERT INTO ban (shelf_id, edition_id, scope, item_id) VALUES (1, 1, ?, 1)').run(scope);
    add('later');
    add('until:2026-03-31');
    expect(() => add('until:soon')).toThrow(/CHECK/);
    expect(() => add('forever')).toThrow(/CHECK/);
    expect(now.prepare("SELECT name FROM sqlite_master WHERE type = 'index' AND tbl_name = 'ban'").pluck().all()).toEqual(['ban_scope']);
    // The item's foreign key still cascades.
    now.prepare('DELETE FROM item').run();
    expect(now.prepare('SELECT count(*) FROM ban').pluck().get()).toBe(1);
    expect(now.pragma('integrity_check', { simple: true })).toBe('ok');
    now.close();
  });
});
