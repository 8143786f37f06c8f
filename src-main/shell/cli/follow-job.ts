import type { JobState } from '../../api/contracts/jobs.ts';
import type { HandlerTable } from '../../api/handler-table.ts';
import { call, CliApiError } from './call.ts';
import type { CliIo } from './command.ts';
import { escapeControls } from './escape.ts';

function describe(j: JobState): string {
  const p = j.progress;
  return [
    `${Math.round(p.fraction * 100)}%`.padStart(4),
    p.stage,
    p.model ?? '',
    p.iteration !== undefined && p.iterations !== undefined ? `${p.iteration}/${p.iterations}` : '',
  ]
    .filter(Boolean)
    .join(' ');
}

/**
 * Follows a background job to its end, drawing progress on stderr: one rewritten line on a terminal, a
 * plain line per change otherwise (logs stay readable). Ctrl-C cancels the job, and the job writes nothing.
 * A failed or cancelled job becomes a data error (exit 2) with its message.
 */
export async function followJob(table: HandlerTable, job: JobState, io: CliIo, everyMs = 100): Promise<JobState> {
  let last = '';
  const onSigint = () => void call(table, 'job.cancel', { id: job.id });
  process.once('SIGINT', onSigint);
  try {
    let state = job;
    let told = false;
    for (;;) {
      if (state.notice && !told) {
        if (io.errIsTty && last) process.stderr.write('\n');
        io.err(`note: ${state.notice}`);
        told = true;
        last = '';
      }
      const line = describe(state);
      if (line !== last) {
        if (io.errIsTty) process.stderr.write(`\r${escapeControls(line).padEnd(Math.max(last.length, line.length))}`);
        else io.err(line);
        last = line;
      }
      if (state.state !== 'running') break;
      await new Promise((r) => setTimeout(r, everyMs));
      state = await call(table, 'job.status', { id: job.id });
    }
    if (io.errIsTty) process.stderr.write('\n');
    if (state.state === 'failed') throw new CliApiError({ code: 'internal', message: state.error ?? 'the job failed' });
    if (state.state === 'cancelled') throw new CliApiError({ code: 'cancelled', message: 'cancelled: nothing was written' });
    return state;
  } finally {
    process.removeListener('SIGINT', onSigint);
  }
}
