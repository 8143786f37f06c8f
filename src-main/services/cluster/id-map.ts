/**
 * Reads an export's manifest and id maps back (export-signals.ts wrote them), so `import model` can turn
 * Spark's integer ids into the workspace's customers and items.
 */
import fs from 'node:fs';
import path from 'node:path';
import { asyncBufferFromFile, parquetMetadataAsync, parquetRead } from 'hyparquet';
import { InputError } from '../../core/errors.ts';
import { EXPORT_FORMAT, EXPORT_MANIFEST, type ExportManifest } from './export-signals.ts';
import { partFiles } from './factor-files.ts';

export function readManifest(exportDir: string): ExportManifest {
  const file = path.join(exportDir, EXPORT_MANIFEST);
  let text: string;
  try {
    text = fs.readFileSync(file, 'utf8');
  } catch {
    throw new InputError(
      `no id map here: ${EXPORT_MANIFEST} is missing. Give the folder \`shelfwright export signals\` wrote with --ids (by default the model folder's parent is used)`,
      { file: exportDir },
    );
  }
  let m: Partial<ExportManifest>;
  try {
    m = JSON.parse(text) as Partial<ExportManifest>;
  } catch (e) {
    throw new InputError(`not readable JSON (${(e as Error).message})`, { file });
  }
  if (m.format !== EXPORT_FORMAT || m.version !== 1 || typeof m.fingerprint !== 'string' || typeof m.erasureGeneration !== 'number') {
    throw new InputError(`not a Shelfwright export manifest (format ${String(m.format)}, version ${String(m.version)})`, { file });
  }
  return m as ExportManifest;
}

/** The external id of every exported index (customers or items), checked to be 0 .. n − 1 each once. */
export async function readIdMap(exportDir: string, name: 'customers' | 'items', expected: number): Promise<string[]> {
  const dir = path.join(exportDir, name);
  if (!fs.existsSync(dir)) throw new InputError(`the id map ${name}/ is missing from the export`, { file: exportDir });
  const ids: (string | undefined)[] = new Array<string | undefined>(expected);
  for (const file of partFiles(dir)) {
    let index: ArrayLike<unknown> = [];
    let id: ArrayLike<unknown> = [];
    try {
      const buffer = await asyncBufferFromFile(file);
      const metadata = await parquetMetadataAsync(buffer);
      await parquetRead({
        file: buffer,
        metadata,
        columns: ['index', 'id'],
        onChunk: (c) => {
          if (c.columnName === 'index') index = concat(index, c.columnData);
          else id = concat(id, c.columnData);
        },
      });
    } catch (e) {
      throw new InputError(`not a readable id map (${(e as Error).message})`, { file });
    }
    if (index.length !== id.length) throw new InputError(`the id map has ${index.length} indices for ${id.length} ids`, { file });
    for (let r = 0; r < index.length; r++) {
      const q = Number(index[r]);
      if (!Number.isInteger(q) || q < 0 || q >= expected || ids[q] !== undefined || typeof id[r] !== 'string') {
        throw new InputError(`row ${r + 1}: index ${String(index[r])} is outside 0..${expected - 1}, repeated, or has no id`, { file, line: r + 1 });
      }
      ids[q] = id[r] as string;
    }
  }
  const missing = ids.findIndex((x) => x === undefined);
  if (missing >= 0 || ids.length !== expected) throw new InputError(`the id map has no id for index ${missing} (the manifest says ${expected})`, { file: dir });
  return ids as string[];
}

function concat(a: ArrayLike<unknown>, b: ArrayLike<unknown>): ArrayLike<unknown> {
  if (a.length === 0) return b;
  return [...Array.from(a), ...Array.from(b)];
}
