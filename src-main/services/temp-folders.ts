import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { processRunning } from '../store/process-alive.ts';

/**
 * Private temporary folders (uploads, staged holdout files, the demo's generated files, a browser profile)
 * carry the id of the process that made them: `shelfwright-<purpose>-<pid>-XXXXXX`. A run that is killed
 * cannot remove its own, so each start sweeps the folders whose process is gone (`sweepTempFolders`).
 * A folder of a process that is still running (another window, a second command) is never touched.
 */
const NAME = /^shelfwright-[a-z]+-(\d+)-[A-Za-z0-9]{6}$/;

/** A new private folder (0700) for `purpose` (lower-case letters) under `parent`, the system temp folder by default. */
export function makeTempFolder(purpose: string, parent: string = os.tmpdir()): string {
  const dir = fs.mkdtempSync(path.join(parent, `shelfwright-${purpose}-${process.pid}-`));
  fs.chmodSync(dir, 0o700); // mkdtemp makes it 0700 already; said explicitly, as these folders hold user data
  return dir;
}


/**
 * Removes the folders `makeTempFolder` made for processes that no longer run, and that belong to this user.
 * Returns the paths removed. Errors (a folder going away meanwhile, no permission) are skipped: a sweep is
 * tidying, never a reason to fail a start.
 */
export function sweepTempFolders(parent: string = os.tmpdir()): string[] {
  const removed: string[] = [];
  let names: string[];
  try {
    names = fs.readdirSync(parent);
  } catch {
    return removed;
  }
  const uid = process.getuid?.();
  for (const name of names) {
    const m = NAME.exec(name);
    if (!m) continue;
    const pid = Number(m[1]);
    if (pid === process.pid || processRunning(pid)) continue;
    const dir = path.join(parent, name);
    try {
      const st = fs.lstatSync(dir);
      if (!st.isDirectory() || (uid !== undefined && st.uid !== uid)) continue;
      fs.rmSync(dir, { recursive: true, force: true });
      removed.push(dir);
    } catch {
      // gone already, or not ours to remove
    }
  }
  return removed;
}
