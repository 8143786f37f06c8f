import { afterAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { importFile } from '../../src-main/services/import.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { CUSTOMERS_CSV, ITEMS_CSV, SIGNALS_CSV, snapshot, tempDir, write } from './helpers.ts';

/**
 * DESIGN.md: "a killed process leaves the workspace as it was before the interrupted write". A child
 * imports 400,000 signals; we SIGKILL it once it says rows are being written, then reopen the file.
 * Relies on SQLite's atomic commit (sqlite.org "Atomic Commit In SQLite"; WAL mode: uncommitted frames are
 * ignored on recovery).
 */
const dir = tempDir('shelfwright-crash-');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('an import killed mid-transaction', () => {
  // 'append': the file is appended to a table that has signals with the identity index dropped (issue 11
  // part 5); the kill must bring the index back with the rows.
  it.each(['single', 'thread', 'append'])('leaves exactly the earlier contents and an intact file (parsing: %s)', async (mode) => {
    const file = path.join(dir, `crash-${mode}.shelf`);
    const db = openWorkspace(file);
    await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS_CSV) });
    await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS_CSV) });
    await importFile(db, { target: 'signals', file: write(dir, 'signals.csv', SIGNALS_CSV) });
    const before = snapshot(db);
    db.close();

    const rows: string[] = ['customer,item,kind,value,at'];
    for (let i = 0; i < 400_000; i++) rows.push(`r${1 + (i % 2)},b${1 + (i % 3)},view,1,${1_600_000_000 + i}`);
    const big = write(dir, `big-${mode}.csv`, rows.join('\n') + '\n');

    const child = spawn('npx', ['tsx', path.join('test', 'ingest', 'crash-child.ts'), file, big, mode], {
      cwd: process.cwd(),
      stdio: ['ignore', 'pipe', 'pipe'],
      detached: true, // its own process group, so the kill below reaches node under npx and tsx
    });
    let out = '';
    let err = '';
    child.stderr.on('data', (d: Buffer) => (err += d.toString()));
    const exit = new Promise<NodeJS.Signals | number | null>((resolve) => child.on('exit', (code, sig) => resolve(sig ?? code)));
    await new Promise<void>((resolve, reject) => {
      child.stdout.on('data', (d: Buffer) => {
        out += d.toString();
        if (out.includes('inserting')) {
          // npx runs tsx, which runs node: kill the whole group so the process holding the file dies.
          process.kill(-child.pid!, 'SIGKILL');
          resolve();
        }
      });
      child.on('exit', () => reject(new Error(`child ended before it was killed: ${out} ${err}`)));
    });
    await exit;
    expect(out).not.toMatch(/done/);

    const again = openWorkspace(file);
    expect(again.pragma('integrity_check', { simple: true })).toBe('ok');
    expect(snapshot(again)).toEqual(before);
    again.close();
  });
});
