import type { AppContext } from '../../services/context.ts';
import { buildDemoWorkspace, checkDemoTarget } from '../../services/demo.ts';
import { workspaceInfo } from '../../services/workspace-info.ts';
import type { Handler } from '../handler-table.ts';

export function workspaceHandlers(ctx: AppContext): {
  'workspace.info': Handler<'workspace.info'>;
  'workspace.open': Handler<'workspace.open'>;
  'workspace.demo': Handler<'workspace.demo'>;
} {
  return {
    'workspace.info': () => workspaceInfo(ctx),
    'workspace.open': (req) => {
      ctx.open(req.file, { create: req.create });
      return workspaceInfo(ctx);
    },
    'workspace.demo': (req) => {
      checkDemoTarget(req.file); // refused now, as an input error, rather than as a failed job later
      return ctx.jobs.start('demo', async (report, signal) => {
        // The file is replaced whole; a connection to the old one must not outlive it. If the build is
        // refused (another process has the file open) or fails, the app gets its workspace back.
        const reopen = ctx.isOpen && ctx.file === req.file;
        if (reopen) ctx.close();
        let fraction = 0;
        const built = await buildDemoWorkspace(req.file, {
          ...(req.seed !== undefined && { seed: req.seed }),
          train: req.train,
          signal,
          onStep: (stage) => report({ stage, fraction: (fraction = Math.min(0.3, fraction + 0.06)) }),
          onTrainProgress: (p) =>
            report({
              stage: 'training models',
              fraction: 0.3 + 0.7 * p.fraction,
              ...(p.model && { model: p.model }),
              ...(p.iteration !== undefined && { iteration: p.iteration }),
              ...(p.iterations !== undefined && { iterations: p.iterations }),
            }),
        }).catch((e: unknown) => {
          if (reopen && !ctx.isOpen) ctx.open(req.file, { create: false });
          throw e;
        });
        ctx.open(req.file, { create: false });
        const rows = built.imports.map((r) => `${r.added} ${r.target}`).join(', ');
        return `${built.shop}: ${rows}${built.training ? `, ${built.training.models.length} models` : ''} in ${(built.elapsedMs / 1000).toFixed(1)} s`;
      });
    },
  };
}
