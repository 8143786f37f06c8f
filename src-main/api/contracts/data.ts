import { z } from 'zod';
import { SIGNAL_KINDS } from '../../core/types.ts';
import { method } from '../define.ts';

/** Import and workspace statistics: the data a workspace holds. */

export const ImportTarget = z.enum(['items', 'customers', 'signals']);
export const ImportFormat = z.enum(['csv', 'json', 'jsonl']);

/**
 * The largest file a page uploads as `content`. The web shell refuses request bodies over 32 MiB, and a file
 * grows when it is sent as a JSON string (every line break and quote is escaped), so uploads stop well below
 * that; a bigger file is imported by its path, which the main process reads as a stream.
 */
export const MAX_UPLOAD_BYTES = 24 * 1024 * 1024;

/**
 * The largest file the web shell takes as a streamed upload (`POST /upload`, raw bytes, written to disk as
 * they arrive); the answer's id is then given to import.preview / import.run as `upload`.
 */
export const MAX_STREAMED_UPLOAD_BYTES = 4 * 1024 ** 3;

/**
 * What to import, exactly one of: a file on this machine (CLI, Electron); its content sent by a page
 * (`fileName` with `content`, for small files); or the id of a file the page streamed to `POST /upload`
 * (web shell, where a browser cannot hand over a path); and how to read it.
 */

export const ImportRequest = z
  .object({
    file: z.string().min(1).optional(),
    fileName: z.string().min(1).optional(),
    content: z.string().optional(),
    /** The id `POST /upload` answered with. import.run removes the upload when it ends; import.preview keeps it. */
    upload: z
      .string()
      .regex(/^[0-9a-f]{32}$/)
      .optional(),
    target: ImportTarget,
    format: ImportFormat.optional(),
    delimiter: z.string().length(1).optional(),
    dateOrder: z.enum(['dmy', 'mdy']).optional(),
    /** Signals from a file without a kind column: the kind every row gets (a file with one is refused). */
    kind: z.enum(SIGNAL_KINDS).optional(),
    mapping: z.record(z.string(), z.string()).optional(),
    /** A JSON file {"field": "Header"} on this machine; `mapping` entries override its own. */
    mappingFile: z.string().min(1).optional(),
    unknown: z.enum(['reject', 'create']).optional(),
    acceptPartial: z.boolean().optional(),
  })
  .strict()
  .refine(
    (s) => {
      const named = s.fileName !== undefined;
      if (named !== (s.content !== undefined)) return false; // fileName and content go together
      return [s.file !== undefined, named, s.upload !== undefined].filter(Boolean).length === 1;
    },
    { message: 'give exactly one of: file, fileName with content, or upload' },
  );
export type ImportRequest = z.infer<typeof ImportRequest>;

export const RowProblem = z.object({
  line: z.number().int(),
  column: z.union([z.string(), z.number()]).nullable(),
  reason: z.string(),
  /** `file:line:column: reason`, as editors and terminals link it. */
  message: z.string(),
});

export const ImportReport = z.object({
  target: ImportTarget,
  file: z.string(),
  format: z.string(),
  delimiter: z.string().nullable(),
  rows: z.number().int(),
  added: z.number().int(),
  updated: z.number().int(),
  unchanged: z.number().int(),
  rejected: z.number().int(),
  customersCreated: z.number().int(),
  errors: z.array(RowProblem),
  errorCount: z.number().int(),
  /** Signals dated after today: imported, but warned about (`warnings`). */
  futureDated: z.number().int(),
  warnings: z.array(z.string()),
  committed: z.boolean(),
  elapsedMs: z.number(),
  mapping: z.record(z.string(), z.string()),
  /** Items with an image column: what became of the pictures it named (placeholders are warned about). */
  pictures: z
    .object({
      named: z.number().int(), ready: z.number().int(), made: z.number().int(), reused: z.number().int(), missing: z.number().int(),
      broken: z.number().int(), remote: z.number().int(), unread: z.number().int(), cleared: z.number().int(),
    })
    .optional(),
});
export type ImportReport = z.infer<typeof ImportReport>;

export const ImportPreview = z.object({
  format: z.string(),
  delimiter: z.string().nullable(),
  headers: z.array(z.string()),
  mapping: z.record(z.string(), z.string()),
  extraColumns: z.array(z.string()),
  sampleRows: z.array(z.array(z.string())),
  /** The file line each sample row starts on. */
  sampleLines: z.array(z.number().int()),
  problems: z.array(z.string()),
});
export type ImportPreview = z.infer<typeof ImportPreview>;

export const WorkspaceStats = z.object({
  items: z.number().int(),
  availableItems: z.number().int(),
  promotedItems: z.number().int(),
  customers: z.number().int(),
  signals: z.number().int(),
  firstSignalAt: z.number().nullable(),
  lastSignalAt: z.number().nullable(),
  density: z.number(),
  signalsByKind: z.record(z.string(), z.number()),
  topCategoriesByItems: z.array(z.object({ category: z.string(), items: z.number() })),
  topCategoriesBySignals: z.array(z.object({ category: z.string(), signals: z.number() })),
  longTailShare: z.number().nullable(),
  coldItems: z.number().int(),
  lastImportAt: z.number().nullable(),
});
export type WorkspaceStats = z.infer<typeof WorkspaceStats>;

export const dataMethods = {
  'import.preview': method({
    summary: 'Detect format, delimiter and column mapping of a file, with its first rows.',
    request: ImportRequest,
    response: ImportPreview,
  }),
  'import.run': method({
    summary: 'Import a file into the workspace in one transaction; rejects are reported by line and column.',
    request: ImportRequest,
    response: ImportReport,
  }),
  'workspace.stats': method({
    summary: 'Counts, date range, density, kinds, top categories and long-tail share of the open workspace.',
    request: z.object({}).strict(),
    response: WorkspaceStats,
  }),
};
