import { compact } from '../../core/util/compact.ts';
import { importFile, previewImport } from '../../services/import.ts';
import type { AppContext } from '../../services/context.ts';
import { renamePath, withFile } from '../../services/staged-file.ts';
import { checkInputFile } from '../../services/user-file.ts';
import { getWorkspaceStats } from '../../services/stats.ts';
import type { Handler } from '../handler-table.ts';

export function dataHandlers(ctx: AppContext): {
  'import.preview': Handler<'import.preview'>;
  'import.run': Handler<'import.run'>;
  'workspace.stats': Handler<'workspace.stats'>;
} {
  return {
    'import.preview': ({ file, fileName, content, target, ...options }) => {
      if (file !== undefined) checkInputFile(file); // a folder or a missing path, said plainly before the reader runs
      return withFile({ file, fileName, content }, async (path, shownAs) => {
        const p = await previewImport(path, target, compact(options));
        return { ...p, problems: p.problems.map((m) => renamePath(m, path, shownAs)) };
      });
    },
    'import.run': ({ file, fileName, content, target, ...options }) => {
      if (file !== undefined) checkInputFile(file);
      return withFile({ file, fileName, content }, async (path, shownAs) => {
        const r = await importFile(ctx.db, { ...compact(options), target, file: path });
        return {
          ...r,
          file: shownAs,
          errors: r.errors.map((e) => ({ ...e, message: renamePath(e.message, path, shownAs) })),
        };
      });
    },
    'workspace.stats': () => getWorkspaceStats(ctx.db),
  };
}
