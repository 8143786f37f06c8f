/**
 * Child process of crash.test.ts: imports a large signals file into an existing workspace and prints
 * "inserting" once rows are being written, so the parent can SIGKILL it mid-transaction.
 * Usage: npx tsx test/ingest/crash-child.ts <workspace> <signals.csv> [single|thread|append]
 * (the signal path: parsing in this thread or in a worker thread, or in this thread appending with the
 * identity index dropped; default: chosen by file size).
 */
import { runImport } from '../../src-main/ingest/run.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

const [workspace, file, mode] = process.argv.slice(2);
if (!workspace || !file) throw new Error('usage: crash-child.ts <workspace> <signals.csv> [single|thread]');
const db = openWorkspace(workspace);
let announced = false;
runImport(db, {
  target: 'signals',
  file,
  ...(mode && { parseThread: mode === 'thread' }),
  // 'append': the appending path that drops the identity index and rebuilds it (catalogue-writes.ts).
  ...(mode === 'append' && { appendPath: 'rebuild' as const }),
  onProgress: () => {
    if (!announced) process.stdout.write('inserting\n');
    announced = true;
  },
}).then(
  (r) => process.stdout.write(`done ${r.added}\n`),
  (e: unknown) => {
    process.stderr.write(`${String(e)}\n`);
    process.exitCode = 1;
  },
);
