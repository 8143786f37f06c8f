/**
 * Inside one app (the web shell or Electron serve every request on one connection): an import keeps its
 * transaction open while it reads its file, and a request that arrives meanwhile must neither slip its
 * writes into that transaction (to be rolled back with a failed import after it was reported done) nor
 * block the import it would wait for. It is refused clearly instead, and works once the import is over.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WorkspaceBusyError } from '../../src-main/core/errors.ts';
import { forgetCustomer } from '../../src-main/services/forget.ts';
import { importFile } from '../../src-main/services/import.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { importSmallShop } from '../cli/small-shop.ts';
import { signalPipe } from './processes.ts';

let dir: string;
let file: string;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-same-app-'));
  file = path.join(dir, 'w.sqlite');
  await importSmallShop(file, path.join(dir, 'shop'), 13);
}, 120_000);

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('one app, one connection', () => {
  it('an erasure asked while an import is reading its file is refused, not folded into the import that then fails', async () => {
    const db = openWorkspace(file);
    try {
      const pipe = signalPipe(dir, 'customer,item,kind,value,at');
      const importing = importFile(db, { target: 'signals', file: pipe.file });
      await pipe.opened;
      expect(() => forgetCustomer(db, 'C000002')).toThrow(WorkspaceBusyError);
      expect(() => forgetCustomer(db, 'C000002')).toThrow(
        'the workspace is busy: this app is still writing to it (an import of signals). Nothing was changed; try again when it has finished.',
      );
      // The import fails on an unknown item and rolls back, as a failed import must.
      await pipe.end(['C000002,NO-SUCH-ITEM,view,1,2026-12-01T10:00:00Z']);
      expect((await importing).committed).toBe(false);
      // Afterwards the erasure goes through and stays.
      expect(forgetCustomer(db, 'C000002').customer).toBe('C000002');
      expect(db.prepare("SELECT count(*) FROM customer WHERE external_id = 'C000002'").pluck().get()).toBe(0);
    } finally {
      db.close();
    }
  }, 60_000);

  it('two imports of the same app take turns on its one connection: both are kept', async () => {
    const db = openWorkspace(file);
    try {
      const before = db.prepare('SELECT count(*) FROM signal').pluck().get() as number;
      const pipe = signalPipe(dir, 'customer,item,kind,value,at');
      const first = importFile(db, { target: 'signals', file: pipe.file });
      await pipe.opened;
      const other = path.join(dir, 'other.csv');
      fs.writeFileSync(other, 'customer,item,kind,value,at\nC000005,I00003,view,1,2026-12-02T08:00:00Z\n');
      const second = importFile(db, { target: 'signals', file: other });
      await pipe.end(['C000005,I00004,view,1,2026-12-02T07:00:00Z']);
      expect((await first).committed).toBe(true);
      expect((await second).committed).toBe(true);
      expect(db.prepare('SELECT count(*) FROM signal').pluck().get()).toBe(before + 2);
    } finally {
      db.close();
    }
  }, 60_000);
});
