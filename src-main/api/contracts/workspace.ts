import { z } from 'zod';
import { method } from '../define.ts';
import { JobState } from './jobs.ts';

export const WorkspaceInfo = z.object({
  open: z.boolean(),
  file: z.string().nullable(),
  schemaVersion: z.number().int().nullable(),
  items: z.number().int(),
  customers: z.number().int(),
  signals: z.number().int(),
});
export type WorkspaceInfo = z.infer<typeof WorkspaceInfo>;

export const workspaceMethods = {
  'workspace.info': method({
    summary: 'Which workspace is open and how much it holds.',
    request: z.object({}).strict(),
    response: WorkspaceInfo,
  }),
  'workspace.open': method({
    summary: 'Open a workspace file, creating it when asked.',
    request: z.object({ file: z.string().min(1, 'give the path of a workspace file'), create: z.boolean().default(false) }).strict(),
    response: WorkspaceInfo,
  }),
  'workspace.demo': method({
    summary: 'Build the demo workspace (generate, import, train) as a job, then open it.',
    request: z
      .object({
        file: z.string().min(1, 'give the path of the demo workspace file'),
        seed: z.number().int().min(0).optional(),
        train: z.boolean().default(true),
      })
      .strict(),
    response: JobState,
  }),
};
