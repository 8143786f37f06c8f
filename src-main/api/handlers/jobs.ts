import type { AppContext } from '../../services/context.ts';
import type { Handler } from '../handler-table.ts';

export function jobHandlers(ctx: AppContext): { 'job.status': Handler<'job.status'>; 'job.cancel': Handler<'job.cancel'> } {
  return {
    'job.status': (req) => ctx.jobs.status(req.id),
    'job.cancel': (req) => ctx.jobs.cancel(req.id),
  };
}
