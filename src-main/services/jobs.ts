import { randomUUID } from 'node:crypto';
import { CancelledError, NotFoundError } from '../core/errors.ts';

/** Where a long task is: a stage name, a fraction in [0, 1] and, for iterative models, the iteration. */
export interface JobProgress {
  stage: string;
  fraction: number;
  model?: string;
  iteration?: number;
  iterations?: number;
  /** Said once, before a long task starts (training on a large workspace: services/train/outlook.ts); kept on the job. */
  notice?: string;
}

export type JobKind = 'train' | 'evaluate' | 'demo';
export type JobPhase = 'running' | 'done' | 'failed' | 'cancelled';

export interface JobState {
  id: string;
  kind: JobKind;
  state: JobPhase;
  progress: JobProgress;
  startedAt: number;
  finishedAt: number | null;
  error: string | null;
  /** A one-line account of the result for a status line ("trained 5 models in 12.3 s"). */
  summary: string | null;
  /** What the task said up front (JobProgress.notice), absent when it said nothing. */
  notice?: string;
}

export type JobBody = (report: (p: JobProgress) => void, signal: AbortSignal) => Promise<string>;

/**
 * Long tasks (training, evaluation) run in the background while the shells poll their progress: the same
 * polling works over IPC, HTTP and in the terminal. Finished jobs are kept so a late poll still sees how
 * they ended; one job of each kind at a time.
 */
export class JobRegistry {
  readonly #jobs = new Map<string, { state: JobState; controller: AbortController; done: Promise<void> }>();

  start(kind: JobKind, body: JobBody): JobState {
    const running = [...this.#jobs.values()].find((j) => j.state.kind === kind && j.state.state === 'running');
    if (running) return { ...running.state };
    const controller = new AbortController();
    const state: JobState = {
      id: randomUUID(),
      kind,
      state: 'running',
      progress: { stage: 'starting', fraction: 0 },
      startedAt: Date.now(),
      finishedAt: null,
      error: null,
      summary: null,
    };
    const done = body(({ notice, ...p }) => {
      if (notice !== undefined) state.notice = notice;
      state.progress = { ...p, fraction: Math.min(1, Math.max(0, p.fraction)) };
    }, controller.signal).then(
      (summary) => {
        state.state = 'done';
        state.summary = summary;
        state.progress = { ...state.progress, stage: 'done', fraction: 1 };
      },
      (e: unknown) => {
        state.state = e instanceof CancelledError || controller.signal.aborted ? 'cancelled' : 'failed';
        state.error = state.state === 'cancelled' ? null : e instanceof Error ? e.message : String(e);
      },
    ).finally(() => {
      state.finishedAt = Date.now();
    });
    this.#jobs.set(state.id, { state, controller, done });
    return { ...state };
  }

  status(id: string): JobState {
    const job = this.#jobs.get(id);
    if (!job) throw new NotFoundError(`no job ${id}`);
    return { ...job.state, progress: { ...job.state.progress } };
  }

  cancel(id: string): JobState {
    const job = this.#jobs.get(id);
    if (!job) throw new NotFoundError(`no job ${id}`);
    if (job.state.state === 'running') job.controller.abort();
    return this.status(id);
  }

  /** Resolves when the job has ended, however it ended (tests and the CLI wait on this). */
  async settled(id: string): Promise<JobState> {
    const job = this.#jobs.get(id);
    if (!job) throw new NotFoundError(`no job ${id}`);
    await job.done;
    return this.status(id);
  }

  /** Cancels everything still running (app shutdown). */
  cancelAll(): void {
    for (const j of this.#jobs.values()) if (j.state.state === 'running') j.controller.abort();
  }
}
