import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';

const dirs: string[] = [];
const tmp = () => {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-api-'));
  dirs.push(d);
  return d;
};
afterEach(() => {
  for (const d of dirs.splice(0)) fs.rmSync(d, { recursive: true, force: true });
});

describe('invoke', () => {
  it('refuses a method that is not in the contract', async () => {
    const r = await invoke(createHandlerTable(new AppContext()), 'workspace.drop', {});
    expect(r).toEqual({ ok: false, error: { code: 'input', message: 'unknown method: workspace.drop' } });
  });

  it('parses the request with its schema and names the bad field', async () => {
    const r = await invoke(createHandlerTable(new AppContext()), 'workspace.open', { file: 42 });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.error.code).toBe('input');
      expect(r.error.message).toMatch(/^file: /);
    }
  });

  it('refuses unknown fields instead of ignoring them', async () => {
    const r = await invoke(createHandlerTable(new AppContext()), 'workspace.info', { verbose: true });
    expect(r.ok).toBe(false);
  });

  it('opens a new workspace and reports it empty', async () => {
    const ctx = new AppContext();
    const file = path.join(tmp(), 'w.sqlite');
    const r = await invoke(createHandlerTable(ctx), 'workspace.open', { file, create: true });
    expect(r).toMatchObject({ ok: true, value: { open: true, file, items: 0, customers: 0, signals: 0 } });
    ctx.close();
  });

  it('says what to do when no workspace is open and one is needed', async () => {
    const ctx = new AppContext();
    const r = await invoke(createHandlerTable(ctx), 'workspace.open', { file: path.join(tmp(), 'missing.sqlite') });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.message).toMatch(/no workspace at/);
  });

  it('never sends a stack trace', async () => {
    const ctx = new AppContext();
    const bad = path.join(tmp(), 'not-a-db.sqlite');
    fs.writeFileSync(bad, 'this is plain text, not SQLite');
    const r = await invoke(createHandlerTable(ctx), 'workspace.open', { file: bad });
    expect(r.ok).toBe(false);
    expect(JSON.stringify(r)).not.toMatch(/\bat .*\.ts:\d+/);
  });
});
