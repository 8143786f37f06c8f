/**
 * A second Shelfwright process for the two-process tests: opens the workspace, takes its write lock the way
 * every long write does (store/write-lock.ts), does one real write of the kind asked, prints `ready`, and
 * commits only when a line arrives on stdin, then prints `released`. This gives the tests a deterministic
 * interleaving: they wait on these words, never on time.
 *
 *   write-holder.ts FILE forget CUSTOMER     erase a customer (services/forget.ts)
 *   write-holder.ts FILE open                just keep the workspace open, idle (an app left running)
 */
import readline from 'node:readline';
import { eraseCustomerRows } from '../../src-main/services/forget.ts';
import { scrubFreedBytes } from '../../src-main/store/erasure.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { beginWriteAsync, endWrite } from '../../src-main/store/write-lock.ts';

const [file, action, arg] = process.argv.slice(2);
const db = openWorkspace(file!, { create: false });
if (action === 'forget') {
  await beginWriteAsync(db, { work: 'an erasure' });
  eraseCustomerRows(db, arg!); // inside the held write; the freed bytes are scrubbed after the commit
} else if (action !== 'open') throw new Error(`unknown action ${action}`);
process.stdout.write('ready\n');
const lines = readline.createInterface({ input: process.stdin });
await new Promise<void>((resolve) => lines.once('line', () => resolve()));
if (db.inTransaction) {
  endWrite(db, true);
  if (action === 'forget') scrubFreedBytes(db);
}
db.close();
process.stdout.write('released\n');
lines.close();
