/**
 * A training run that read the data before a customer was erased must not store its models afterwards
 * (DESIGN.md: "erasure is final (no model trained before it may bring the person back)"). Found in a
 * review: the iALS model came back with a factor row for every customer read, the erased one included.
 *
 * The interleaving is made deterministic by the training thread's own progress: it reports the 'matrix'
 * stage only after the read transaction that loaded the data has ended, and the models are saved only
 * after its 'done' message, which the main thread handles after this progress callback has returned.
 */
import fs from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { loadIals } from '../../src-main/core/models/ials.ts';
import { forgetCustomer } from '../../src-main/services/forget.ts';
import { JobRegistry, type JobBody } from '../../src-main/services/jobs.ts';
import { trainJob } from '../../src-main/services/train/train-job.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';
import { smallWorkspace } from '../store/models-fixture.ts';

const ws = smallWorkspace({ items: 30, customers: 60 });
afterAll(() => {
  ws.db.close();
  fs.rmSync(ws.dir, { recursive: true, force: true });
});
const options = { params: { ials: { factors: 8, iterations: 4, seed: 2 } }, threads: 2 };

/** The training job, erasing `customer` (through `eraser`) once the thread has read its data. */
function trainThenEraseMidway(eraser: Db, customer: string): JobBody {
  const body = trainJob(ws.db, ws.file, options);
  let erased = false;
  return (report, signal) =>
    body((p) => {
      report(p);
      if (p.stage === 'matrix' && !erased) {
        erased = true;
        forgetCustomer(eraser, customer);
      }
    }, signal);
}

const customers = () => ws.db.prepare('SELECT count(*) FROM customer').pluck().get() as number;

describe('training and forget running at the same time', () => {
  it('refuses to store a run that read the data before the erasure, with a message saying why', async () => {
    const jobs = new JobRegistry();
    await jobs.settled(jobs.start('train', trainJob(ws.db, ws.file, options)).id); // a model of every kind to begin with
    expect(new ModelRepo(ws.db).loadCurrent('ials')).toBeDefined();

    const job = jobs.start('train', trainThenEraseMidway(ws.db, 'cu-7'));
    const end = await jobs.settled(job.id);
    expect(end.state).toBe('failed');
    expect(end.error).toBe(
      'a customer was erased (forget) while training ran, after it had read the data: nothing was saved, ' +
        "since the result was built from the erased person's data. Run it again.",
    );
    expect(customers()).toBe(59);
    // No iALS model at all: forget deleted the old one, and the run's (60 customer rows) was not stored.
    expect(new ModelRepo(ws.db).list().filter((m) => m.kind === 'ials')).toEqual([]);
    // The other kinds are the ones from before the erasure, still stale: nothing of the refused run was stored.
    expect(new ModelRepo(ws.db).list().filter((m) => m.current).every((m) => m.trainedAt <= end.startedAt)).toBe(true);
  });

  it('refuses it too when the erasure comes from another connection (another program on the same file)', async () => {
    const other = openWorkspace(ws.file);
    try {
      const jobs = new JobRegistry();
      const end = await jobs.settled(jobs.start('train', trainThenEraseMidway(other, 'cu-8')).id);
      expect(end.state).toBe('failed');
      expect(end.error).toMatch(/^a customer was erased \(forget\) while training ran/);
      expect(new ModelRepo(ws.db).loadCurrent('ials')).toBeUndefined();
    } finally {
      other.close();
    }
  });

  it('stores a run that read the data after the erasure, with one factor row per remaining customer', async () => {
    const jobs = new JobRegistry();
    const end = await jobs.settled(jobs.start('train', trainJob(ws.db, ws.file, options)).id);
    expect(end.state).toBe('done');
    const ials = loadIals(new ModelRepo(ws.db).loadCurrent('ials')!.bytes);
    expect(ials.customerCount).toBe(customers());
    expect(ials.customerCount).toBe(58);
  });
});
