import type { AppContext } from '../../services/context.ts';
import { workspaceInfo } from '../../services/workspace-info.ts';
import type { Handler } from '../handler-table.ts';

export function workspaceHandlers(ctx: AppContext): {
  'workspace.info': Handler<'workspace.info'>;
  'workspace.open': Handler<'workspace.open'>;
} {
  return {
    'workspace.info': () => workspaceInfo(ctx),
    'workspace.open': (req) => {
      ctx.open(req.file, { create: req.create });
      return workspaceInfo(ctx);
    },
  };
}
