import fs from 'node:fs';
import { z } from 'zod';
import { InputError } from '../core/errors.ts';
import { SIGNAL_KINDS, type SignalKind } from '../core/types.ts';
import { FIELDS, type ImportTarget, type Mapping } from '../ingest/fields.ts';
import { previewFile, type ImportPreview } from '../ingest/preview.ts';
import { runImport, type ImportReport } from '../ingest/run.ts';
import type { Db } from '../store/workspace.ts';

export type { ImportReport, RowError } from '../ingest/run.ts';
export type { ImportPreview } from '../ingest/preview.ts';

const allFields = [...new Set(Object.values(FIELDS).flat())] as [string, ...string[]];

/** A mapping names canonical fields only, each to one source header. */
export const MappingSchema = z.partialRecord(z.enum(allFields), z.string().min(1)).describe('field -> source header');

export const ImportOptionsSchema = z.strictObject({
  target: z.enum(['items', 'customers', 'signals']),
  file: z.string().min(1),
  format: z.enum(['csv', 'json', 'jsonl']).optional(),
  mapping: MappingSchema.optional(),
  mappingFile: z.string().min(1).optional(),
  delimiter: z.string().length(1).optional(),
  dateOrder: z.enum(['dmy', 'mdy']).optional(),
  /** Signals: the kind of every row, for a file without a kind column. */
  kind: z.enum(SIGNAL_KINDS).optional(),
  unknown: z.enum(['reject', 'create']).optional(),
  acceptPartial: z.boolean().optional(),
  /** Items: read picture paths in the image column ('read', default) or only record them (a file sent by a page). */
  pictures: z.enum(['read', 'record']).optional(),
});
export type ImportOptions = z.infer<typeof ImportOptionsSchema> & {
  /** Progress while rows are written (every 10,000 rows). Not part of the serialisable options. */
  onProgress?: (p: { rows: number }) => void;
};

/**
 * Imports one file into the workspace as one transaction (see ingest/run.ts). With `acceptPartial` false
 * (the default) any rejected row leaves the workspace unchanged and the report says `committed: false`;
 * a file that cannot be read at all throws InputError naming file, line and column.
 */
export async function importFile(db: Db, opts: ImportOptions): Promise<ImportReport> {
  const { onProgress, ...plain } = opts;
  const o = parseOptions(plain);
  const mapping = resolveMapping(o.target, o.mapping, o.mappingFile);
  return runImport(db, {
    target: o.target,
    file: o.file,
    ...(o.format && { format: o.format }),
    ...(mapping && { mapping }),
    ...(o.delimiter && { delimiter: o.delimiter }),
    ...(o.dateOrder && { dateOrder: o.dateOrder }),
    ...(o.kind && { kind: o.kind }),
    ...(o.unknown && { unknown: o.unknown }),
    ...(o.acceptPartial !== undefined && { acceptPartial: o.acceptPartial }),
    ...(o.pictures && { pictures: o.pictures }),
    ...(onProgress && { onProgress }),
  });
}

export interface PreviewImportOptions {
  format?: 'csv' | 'json' | 'jsonl';
  delimiter?: string;
  mapping?: Mapping;
  mappingFile?: string;
  dateOrder?: 'dmy' | 'mdy';
  kind?: SignalKind;
}

/** What the column-mapping screen shows before an import: format, headers, detected mapping, 20 rows, problems. */
export async function previewImport(file: string, target: ImportTarget, opts: PreviewImportOptions = {}): Promise<ImportPreview> {
  const o = parseOptions({ target, file, ...opts });
  const mapping = resolveMapping(target, o.mapping, o.mappingFile);
  return previewFile(file, target, {
    ...(o.format && { format: o.format }),
    ...(o.delimiter && { delimiter: o.delimiter }),
    ...(mapping && { mapping }),
    ...(o.dateOrder && { dateOrder: o.dateOrder }),
    ...(o.kind && { kind: o.kind }),
  });
}

function parseOptions(raw: unknown) {
  const r = ImportOptionsSchema.safeParse(raw);
  if (!r.success) {
    const issue = r.error.issues[0]!;
    throw new InputError(`import option ${issue.path.join('.') || '(options)'}: ${issue.message}`);
  }
  return r.data;
}

/** A mapping file is a small JSON object {"field": "Header"}; an explicit `mapping` overrides its entries. */
function resolveMapping(target: ImportTarget, mapping: Mapping | undefined, mappingFile: string | undefined): Mapping | undefined {
  if (!mappingFile) return mapping;
  let raw: unknown;
  try {
    raw = JSON.parse(fs.readFileSync(mappingFile, 'utf8'));
  } catch (e) {
    throw new InputError(`cannot read the mapping file: ${(e as Error).message}`, { file: mappingFile });
  }
  const r = MappingSchema.safeParse(raw);
  if (!r.success) {
    const issue = r.error.issues[0]!;
    const key = issue.path.join('.');
    throw new InputError(
      `mapping file: ${key ? `'${key}': ` : ''}${issue.message} (fields of ${target}: ${FIELDS[target].join(', ')})`,
      { file: mappingFile },
    );
  }
  return { ...(r.data as Mapping), ...mapping };
}
