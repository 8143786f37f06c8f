import { useId, useState } from 'react';
import { useApp } from '../state/store.ts';
import { pct } from './format.ts';
import { jobStageLine } from './job-words.ts';
import { noticeWords, trainingPlan } from './tuning-words.ts';

/**
 * The Models screen's training: what Train will do (the api's default, as `shelfwright train`: search first when
 * the data changed), a way to skip the search (`--no-tune`), and the job's progress. A training predicted long
 * says so when it starts (the job's notice, services/train/outlook.ts): kept beside the bar until the next job,
 * not a message that fades before it can be read.
 */
export function TrainPanel() {
  const job = useApp((s) => s.models.job);
  const models = useApp((s) => s.models.list);
  const error = useApp((s) => s.models.errors.train);
  const start = useApp((s) => s.startTraining);
  const cancel = useApp((s) => s.cancelJob);
  const [skip, setSkip] = useState(false);
  const running = job?.state === 'running';
  const id = useId();
  const p = job?.progress;
  const notice = job?.kind === 'train' && job.notice ? noticeWords(job.notice) : null;
  return (
    <section className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Training</h2>
      <p className="muted small">Trains every model on all signals in the background; the screens stay usable meanwhile.</p>
      <p data-testid="train-plan">{trainingPlan(models, skip)}</p>
      <div className="check">
        <input id={`${id}-skip`} type="checkbox" checked={skip} disabled={running} onChange={(e) => setSkip(e.target.checked)} />
        <label htmlFor={`${id}-skip`}>Skip tuning (train the default settings as they are)</label>
      </div>
      <div className="toolbar">
        {/* Left unsaid, the api's default decides, as for `shelfwright train`; ticked, the same as `--no-tune`. */}
        <button type="button" disabled={running} onClick={() => void start(skip ? { tune: false } : {})}>
          Train models
        </button>
        <button type="button" className="quiet" disabled={!running} onClick={() => void cancel()}>
          Cancel
        </button>
      </div>
      {job && (
        <div className="job" aria-live="polite">
          {notice && (
            <div className="warn" role="note" aria-label="How long this training takes" data-testid="train-notice">
              <p>
                <strong>A long training.</strong> {notice.text}
              </p>
              {notice.quicker && <p>{notice.quicker}</p>}
            </div>
          )}
          <label htmlFor={`${id}-p`}>{jobStageLine(job)}</label>
          <progress id={`${id}-p`} className="progress" max={1} value={p?.fraction ?? 0}>
            {pct(p?.fraction)}
          </progress>
          <p className="small">
            {job.state === 'running' && `${pct(p?.fraction)} done`}
            {job.state === 'done' && (job.summary ?? 'Done.')}
            {job.state === 'cancelled' && 'Cancelled: nothing was written; the previous models are still in use.'}
          </p>
        </div>
      )}
      {error && (
        <p className="error" role="alert">
          {error}
        </p>
      )}
    </section>
  );
}
