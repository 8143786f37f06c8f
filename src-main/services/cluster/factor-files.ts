/**
 * Reads one side of a Spark ALS model (`userFactors/` or `itemFactors/`): a folder of Parquet part files
 * with columns `id: int` and `features: array<float>` (ALS.scala: `userFactors.toDF("id", "features")`,
 * saved by `instance.userFactors.write.format("parquet").save(userPath)`). Each row's vector is written
 * straight into the caller's Float32Array at the row the id map gives, one row group at a time.
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../../core/errors.ts';
import { leafOf, newScratch, openParquet, readLeafPages, type LeafColumn, type ParquetFile, type Scratch } from './parquet-leaf.ts';

/**
 * The data files of a folder Spark wrote: every file whose name does not start with '_' or '.' (Spark's
 * file listing skips those, e.g. `_SUCCESS` and the `.crc` checksums Hadoop writes beside each part).
 */
export function partFiles(dir: string): string[] {
  return fs
    .readdirSync(dir, { withFileTypes: true })
    .filter((e) => e.isFile() && !e.name.startsWith('_') && !e.name.startsWith('.'))
    .map((e) => path.join(dir, e.name))
    .sort();
}

export interface FactorTarget {
  rank: number;
  /** Number of ids the id map knows (ids are 0 .. known − 1). */
  known: number;
  /** Row in `out` for a known id, or −1 to read and drop it (an item or customer no longer in the workspace). */
  rowOf(id: number): number;
  /** rows × rank, row-major; written in place. */
  out: Float32Array;
}

export interface FactorReadReport {
  rows: number;
  kept: number;
  files: number;
}

/** Reads every part file of `dir` into `t.out`; refuses (file, row, id named) wrong lengths, unknown or repeated ids, and non-finite factors. */
export async function readFactorDir(dir: string, side: string, t: FactorTarget): Promise<FactorReadReport> {
  const files = partFiles(dir);
  if (files.length === 0) throw new InputError(`${side}/ holds no Parquet part files`, { file: dir });
  const seen = new Uint8Array(t.known);
  const scratch = newScratch();
  const report: FactorReadReport = { rows: 0, kept: 0, files: files.length };
  for (const file of files) {
    const p = await openParquet(file);
    const idLeaf = leafOf(p, 'id');
    const featureLeaf = leafOf(p, 'features');
    if (idLeaf.maxRepetition !== 0 || (idLeaf.type !== 'INT32' && idLeaf.type !== 'INT64')) {
      throw new InputError(`column 'id' must hold integers (Spark writes int), it holds ${idLeaf.type}`, { file });
    }
    if (featureLeaf.maxRepetition !== 1 || (featureLeaf.type !== 'FLOAT' && featureLeaf.type !== 'DOUBLE')) {
      throw new InputError(`column 'features' must be a list of floats (Spark writes array<float>), it holds ${featureLeaf.type}`, { file });
    }
    let fileRow = 0;
    for (let g = 0; g < p.metadata.row_groups.length; g++) {
      const n = Number(p.metadata.row_groups[g]!.num_rows);
      const ids = readIds(p, g, idLeaf, n, fileRow, scratch);
      const rows = new Int32Array(n);
      for (let r = 0; r < n; r++) {
        const id = ids[r]!;
        const where = { file, line: fileRow + r + 1 };
        if (id < 0 || id >= t.known) {
          throw new InputError(`row ${where.line}: id ${id} is not in the id map (it knows ids 0 to ${t.known - 1}): was this model fitted on another export?`, where);
        }
        if (seen[id]) throw new InputError(`row ${where.line}: id ${id} appears twice in ${side}/`, where);
        seen[id] = 1;
        rows[r] = t.rowOf(id);
      }
      readFeatures(p, g, featureLeaf, rows, ids, fileRow, t, scratch);
      for (let r = 0; r < n; r++) if (rows[r]! >= 0) report.kept++;
      fileRow += n;
    }
    report.rows += fileRow;
  }
  return report;
}

/** The ids of one row group; a null id is refused. */
function readIds(p: ParquetFile, g: number, leaf: LeafColumn, n: number, fileRow: number, scratch: Scratch): Float64Array {
  const ids = new Float64Array(n);
  let r = 0;
  readLeafPages(p, g, leaf, (page) => {
    let v = 0;
    for (let e = 0; e < page.entries; e++, r++) {
      if (page.definition && page.definition[e]! < leaf.maxDefinition) {
        throw new InputError(`row ${fileRow + r + 1}: the id is empty (null)`, { file: p.file, line: fileRow + r + 1, column: 'id' });
      }
      ids[r] = Number(page.values[v++] as number | bigint);
    }
  }, scratch);
  if (r !== n) throw new InputError(`row group ${g + 1} has ${r} ids for ${n} rows`, { file: p.file });
  return ids;
}

/**
 * Walks the feature entries of one row group: repetition level 0 starts a row, an entry at the max
 * definition level carries a value, a lower level is an empty or null list (or a null element).
 */
function readFeatures(p: ParquetFile, g: number, leaf: LeafColumn, rows: Int32Array, ids: Float64Array, fileRow: number, t: FactorTarget, scratch: Scratch): void {
  const k = t.rank;
  const out = t.out;
  let r = -1;
  let f = 0;
  let base = -1;
  const where = () => ({ file: p.file, line: fileRow + r + 1, column: 'features' });
  const endRow = () => {
    if (r >= 0 && f !== k) throw new InputError(`row ${fileRow + r + 1}: id ${ids[r]} has ${f} factors, the model's rank is ${k}`, where());
  };
  readLeafPages(p, g, leaf, (page) => {
    const def = page.definition;
    const rep = page.repetition;
    const values = page.values;
    let v = 0;
    for (let e = 0, count = page.entries; e < count; e++) {
      if (rep[e] === 0) {
        endRow();
        r++;
        f = 0;
        if (r >= rows.length) throw new InputError(`row group ${g + 1} has more feature lists than ids`, { file: p.file });
        base = rows[r]! * k;
      }
      const d = def ? def[e]! : leaf.maxDefinition;
      if (d < leaf.repeatedDefinition) continue; // an empty or null list: endRow reports its length
      if (d < leaf.maxDefinition) throw new InputError(`row ${fileRow + r + 1}: id ${ids[r]} has an empty (null) factor at position ${f + 1}`, where());
      const x = Number(values[v++] as number);
      if (!Number.isFinite(x)) throw new InputError(`row ${fileRow + r + 1}: id ${ids[r]} has a factor that is ${x} (position ${f + 1}): the model diverged; fit it again`, where());
      if (f >= k) throw new InputError(`row ${fileRow + r + 1}: id ${ids[r]} has more than ${k} factors, the model's rank is ${k}`, where());
      if (base >= 0) out[base + f] = x;
      f++;
    }
  }, scratch);
  endRow();
  if (r !== rows.length - 1) throw new InputError(`row group ${g + 1} has ${r + 1} feature lists for ${rows.length} ids`, { file: p.file });
}
