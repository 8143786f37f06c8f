import { compact } from '../../core/util/compact.ts';
import { importFile, previewImport } from '../../services/import.ts';
import type { AppContext } from '../../services/context.ts';
import { renamePath, withFile, type FileSource } from '../../services/staged-file.ts';
import { checkInputFile } from '../../services/user-file.ts';
import { getWorkspaceStats } from '../../services/stats.ts';
import type { ImportRequest } from '../contracts/data.ts';
import type { Handler } from '../handler-table.ts';

export function dataHandlers(ctx: AppContext): {
  'import.preview': Handler<'import.preview'>;
  'import.run': Handler<'import.run'>;
  'workspace.stats': Handler<'workspace.stats'>;
} {
  /** The request's file as a source for withFile; an upload id becomes its staged file (or an input error). */
  function sourceOf({ file, fileName, content, upload }: ImportRequest): FileSource {
    if (file !== undefined) checkInputFile(file); // a folder or a missing path, said plainly before the reader runs
    if (upload === undefined) return { file, fileName, content };
    const staged = ctx.uploads.resolve(upload);
    return { staged: { path: staged.path, fileName: staged.fileName } };
  }

  return {
    'import.preview': (req) => {
      const { file: _f, fileName: _n, content: _c, upload: _u, target, ...options } = req;
      // An upload is kept: the page previews first, then runs.
      return withFile(sourceOf(req), async (path, shownAs) => {
        const p = await previewImport(path, target, compact(options));
        return { ...p, problems: p.problems.map((m) => renamePath(m, path, shownAs)) };
      });
    },
    'import.run': async (req) => {
      const { file: _f, fileName: _n, content: _c, upload, target, ...options } = req;
      const db = ctx.db; // no open workspace: said before the upload is used up, so it can still be imported
      try {
        return await withFile(sourceOf(req), async (path, shownAs) => {
          // A file sent by the page (content or upload) may not make the app read paths on this machine.
          const pictures = req.file === undefined ? 'record' : 'read';
          const r = await importFile(db, { ...compact(options), target, file: path, pictures });
          return {
            ...r,
            file: shownAs,
            errors: r.errors.map((e) => ({ ...e, message: renamePath(e.message, path, shownAs) })),
          };
        });
      } finally {
        // Committed or not, the streamed file has served: a retry chooses the file again.
        if (upload !== undefined) ctx.uploads.remove(upload);
      }
    },
    'workspace.stats': () => getWorkspaceStats(ctx.db),
  };
}
