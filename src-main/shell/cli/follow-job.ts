import type { JobState } from '../../api/contracts/jobs.ts';
import type { HandlerTable } from '../../api/handler-table.ts';
import { call, CliApiError } from './call.ts';
import type { CliIo } from './command.ts';

function describe(j: JobState): string {
  const p = j.progress;
  const iter = p.iteration !== undefined && p.iterations ? ` ${p.iteration}/${p.iterations}` : '';
  return `${p.stage}${p.model ? ` ${p.model}` : ''}${iter}`;
}

/**
 * Follows a background job to its end, drawing progress on stderr: one rewritten line on a terminal,
 * a line per stage otherwise (logs stay readable). Ctrl-C cancels the job before the process ends.
 * Returns the final state; a failed job throws its message as a data error.
 */
export async function followJob(table: HandlerTable, job: JobState, io: CliIo, everyMs = 200): Promise<JobState> {
  let last = '';
  let state = job;
  const onSigint = () => void call(table, 'job.cancel', { id: job.id });
  process.once('SIGINT', onSigint);
  try {
    while (state.state === 'running') {
      const line = describe(state);
      if (io.errIsTty) io.err(`\r\x1b[2K${line} ${(100 * state.progress.fraction).toFixed(0)}%\x1b[1A`);
      else if (line.replace(/ \d+\/\d+$/, '') !== last.replace(/ \d+\/\d+$/, '')) io.err(line);
      last = line;
      await new Promise((r) => setTimeout(r, everyMs));
      state = await call(table, 'job.status', { id: job.id });
    }
  } finally {
    process.removeListener('SIGINT', onSigint);
  }
  if (io.errIsTty) io.err('\r\x1b[2K');
  if (state.state === 'failed') throw new CliApiError({ code: 'internal', message: state.error ?? 'the job failed' });
  if (state.state === 'cancelled') throw new CliApiError({ code: 'cancelled', message: 'cancelled; nothing was written' });
  return state;
}
