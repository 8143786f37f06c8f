import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { makeTempFolder, sweepTempFolders } from '../../src-main/services/temp-folders.ts';

/** Issue 11 part 4: killed runs leave no temp folders behind (cleaned up at the next start). */
const parent = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-temp-sweep-'));
afterAll(() => fs.rmSync(parent, { recursive: true, force: true }));

describe('temporary folders of killed runs', () => {
  it("removes a SIGKILLed run's folder at the next sweep, and keeps a running process's and anything not ours", async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.join('test', 'services', 'temp-child.ts'), parent], { stdio: ['ignore', 'pipe', 'inherit'] });
    const exited = new Promise<void>((resolve) => child.on('exit', () => resolve()));
    const orphan = await new Promise<string>((resolve, reject) => {
      let out = '';
      child.stdout.on('data', (d: Buffer) => {
        out += d.toString();
        if (out.endsWith('\n')) resolve(out.trim());
      });
      child.on('exit', () => reject(new Error(`the child ended before it made its folder: ${out}`)));
    });
    fs.writeFileSync(path.join(orphan, 'clicks.csv'), 'customer,item,kind\n');
    child.kill('SIGKILL');
    await exited;
    expect(path.basename(orphan)).toMatch(new RegExp(`^shelfwright-upload-${child.pid}-`));
    expect(fs.existsSync(orphan)).toBe(true); // what a killed run leaves

    const mine = makeTempFolder('holdout', parent); // this process runs: its folder is in use
    const other = fs.mkdirSync(path.join(parent, 'shelfwright-notes'), { recursive: true })!; // no pid: not made here
    expect(sweepTempFolders(parent)).toEqual([orphan]);
    expect(fs.existsSync(orphan)).toBe(false);
    expect(fs.existsSync(mine)).toBe(true);
    expect(fs.existsSync(other)).toBe(true);
    expect(fs.statSync(mine).mode & 0o777).toBe(0o700);
  });
});
