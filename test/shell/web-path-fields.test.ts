import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CONTRACT } from '../../src-main/api/contract.ts';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { PATH_FIELDS, type PathField } from '../../src-main/api/path-fields.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { startWebShell, type WebShell } from '../../src-main/shell/web/server.ts';

/**
 * An attacker who has the web shell's token (the worst case) names files outside the workspace through every
 * field of PATH_FIELDS. Each request is otherwise valid (its schema accepts it), so only the path rule stands
 * between it and the file.
 */
const SECRET = 'SECRET-FIRST-LINE,never-shown\nsecond,line\n';

/** A valid request for each path field, with `target` in that field. A new PATH_FIELDS entry needs one here. */
const ATTACKS: Record<string, (target: string) => unknown> = {
  'workspace.open file': (target) => ({ file: target, create: true }),
  'workspace.demo file': (target) => ({ file: target, train: false }),
  'import.preview file': (target) => ({ file: target, target: 'items' }),
  'import.preview mappingFile': (target) => ({ fileName: 'a.csv', content: 'id,title\nb1,A\n', target: 'items', mappingFile: target }),
  'import.run file': (target) => ({ file: target, target: 'customers', unknown: 'create' }),
  'import.run mappingFile': (target) => ({ fileName: 'a.csv', content: 'id\nc1\n', target: 'customers', mappingFile: target }),
  'evaluate.holdout source.file': (target) => ({ source: { file: target } }),
  'recommend customersFile': (target) => ({ customersFile: target, out: target }),
  'recommend out': (target) => ({ customers: ['c1'], out: target }),
  'signals.export out': (target) => ({ out: target }),
  'model.import dir': (target) => ({ dir: target }),
  'model.import idsFolder': (target) => ({ dir: 'model', idsFolder: target }),
};
const key = (f: PathField) => `${f.method} ${f.field}`;

/** Names, bytes and modification times of every entry in a folder: what "nothing changed" means here. */
function snapshot(dir: string): Record<string, string> {
  return Object.fromEntries(fs.readdirSync(dir).map((n) => [n, `${fs.readFileSync(path.join(dir, n)).toString('base64')} ${fs.statSync(path.join(dir, n)).mtimeMs}`]));
}

describe('every server path field, driven through the web shell with a valid token', () => {
  let dir: string;
  let outside: string;
  let ctx: AppContext;
  let shell: WebShell;

  beforeAll(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-paths-'));
    outside = path.join(dir, 'outside');
    fs.mkdirSync(outside);
    fs.writeFileSync(path.join(outside, 'secret.csv'), SECRET, { mode: 0o600 });
    fs.writeFileSync(path.join(outside, 'mapping.json'), '{"id": "SECRET-FIRST-LINE"}');
    const renderer = path.join(dir, 'renderer');
    fs.mkdirSync(renderer);
    fs.writeFileSync(path.join(renderer, 'index.html'), '<!doctype html><title>t</title>');
    ctx = new AppContext();
    ctx.open(path.join(dir, 'workspace.sqlite'), { create: true });
    shell = await startWebShell({ table: createHandlerTable(ctx), staticDir: renderer });
  });

  afterAll(async () => {
    await shell.close();
    ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('has an attack for each listed field, and each attack is a request its schema accepts', () => {
    expect(Object.keys(ATTACKS).sort()).toEqual(PATH_FIELDS.map(key).sort());
    for (const f of PATH_FIELDS) {
      const parsed = CONTRACT[f.method].request.safeParse(ATTACKS[key(f)]!(path.join(outside, 'secret.csv')));
      expect(parsed.success, key(f)).toBe(true);
    }
  });

  it('refuses each one, reads nothing and writes nothing outside the workspace', async () => {
    const before = snapshot(outside);
    const infoBefore = await invoke(createHandlerTable(ctx), 'workspace.info', {});
    for (const f of PATH_FIELDS) {
      const targets = f.field === 'mappingFile' ? ['mapping.json', 'new-file.json'] : ['secret.csv', 'new-file.csv'];
      for (const name of targets) {
        const res = await fetch(`${shell.origin}api/${f.method}`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'x-shelfwright-token': shell.token },
          body: JSON.stringify(ATTACKS[key(f)]!(path.join(outside, name))),
        });
        const text = await res.text();
        expect(res.status, `${key(f)} -> ${name}`).toBe(400);
        expect(JSON.parse(text).error.message, key(f)).toMatch(new RegExp(`^${f.field.replace('.', '\\.')}: the web shell takes no paths`));
        expect(text).not.toContain('SECRET-FIRST-LINE');
      }
    }
    // Jobs (the demo build) would run after the answer: none was started.
    expect(snapshot(outside)).toEqual(before);
    expect(fs.readdirSync(dir).sort()).toEqual(['outside', 'renderer', 'workspace.sqlite', 'workspace.sqlite-shm', 'workspace.sqlite-wal']);
    expect(await invoke(createHandlerTable(ctx), 'workspace.info', {})).toEqual(infoBefore);
  });

  it('(control) the same request through the command line path does reach the file, which is why the rule is needed', async () => {
    // Without the rule, import.preview hands back the first line of a file the caller could not read (issue 11).
    const r = await invoke(createHandlerTable(new AppContext()), 'import.preview', ATTACKS['import.preview file']!(path.join(outside, 'secret.csv')));
    expect(JSON.stringify(r)).toContain('SECRET-FIRST-LINE');
  });
});
