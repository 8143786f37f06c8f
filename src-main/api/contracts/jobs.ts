import { z } from 'zod';
import { method } from '../define.ts';

export const JobState = z.object({
  id: z.string(),
  kind: z.enum(['train', 'evaluate', 'demo']),
  state: z.enum(['running', 'done', 'failed', 'cancelled']),
  progress: z.object({
    stage: z.string(),
    fraction: z.number().min(0).max(1),
    model: z.string().optional(),
    iteration: z.number().int().optional(),
    iterations: z.number().int().optional(),
  }),
  startedAt: z.number(),
  finishedAt: z.number().nullable(),
  error: z.string().nullable(),
  summary: z.string().nullable(),
  /** Said once before a long task starts (a large workspace's training: how long, and what is quicker). */
  notice: z.string().optional(),
});
export type JobState = z.infer<typeof JobState>;

const JobRef = z.object({ id: z.string().min(1) }).strict();

export const jobMethods = {
  'job.status': method({ summary: 'Progress of a training or evaluation job.', request: JobRef, response: JobState }),
  'job.cancel': method({ summary: 'Stop a running job; nothing it was computing is written.', request: JobRef, response: JobState }),
};
