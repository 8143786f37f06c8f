/**
 * Writes factors in the layout Spark's `ALSModel.save` produces, so a model fitted here can be loaded by
 * `ALSModel.load` on a cluster, and so the round trip (fit here, write, `import model`) can be checked:
 *
 *   DIR/metadata/part-00000        one line of JSON: class, timestamp, sparkVersion, uid, paramMap,
 *                                  defaultParamMap, rank (ReadWrite.scala `getMetadataToSave`; the rank is
 *                                  the extra field of ALS.scala `ALSModelWriter.saveImpl`)
 *   DIR/metadata/_SUCCESS          (Hadoop's output committer marks a finished job so)
 *   DIR/userFactors/part-NNNNN-<uuid>-c000.snappy.parquet, _SUCCESS     id: int, features: array<float>
 *   DIR/itemFactors/...            the same for items
 *
 * The Parquet schema is Spark's for `FeatureData(id: Int, features: Array[Float])` in its standard
 * (non-legacy) list form: `required int32 id; optional group features (LIST) { repeated group list {
 * required float element; } }`. Snappy is hyparquet-writer's default codec, as it is Spark's.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { parquetWriteFile } from 'hyparquet-writer';
import { InputError } from '../../core/errors.ts';
import { ALS_MODEL_CLASS } from '../../core/models/spark-als.ts';
import type { IalsModel } from '../../core/models/ials.ts';

const ROWS_PER_PART = 100_000;

export interface SparkModelOptions {
  /** Spark's integer id of each factor row (default: the row index). */
  userIds?: Int32Array;
  itemIds?: Int32Array;
  regParam: number;
  alpha: number;
  maxIter: number;
  sparkVersion?: string;
}

export function writeSparkModel(model: IalsModel, dir: string, o: SparkModelOptions): void {
  if (fs.existsSync(dir)) throw new InputError('the model folder already exists: give a new folder name', { file: dir });
  fs.mkdirSync(path.join(dir, 'metadata'), { recursive: true });
  const k = model.factors;
  const uid = `ALS_${crypto.randomBytes(6).toString('hex')}`;
  const metadata = {
    class: ALS_MODEL_CLASS,
    timestamp: Date.now(),
    sparkVersion: o.sparkVersion ?? '3.5.1',
    uid,
    paramMap: { implicitPrefs: true, rank: k, regParam: o.regParam, alpha: o.alpha, maxIter: o.maxIter },
    defaultParamMap: { userCol: 'user', itemCol: 'item', coldStartStrategy: 'nan', predictionCol: 'prediction', blockSize: 4096 },
    rank: k,
  };
  fs.writeFileSync(path.join(dir, 'metadata', 'part-00000'), `${JSON.stringify(metadata)}\n`);
  fs.writeFileSync(path.join(dir, 'metadata', '_SUCCESS'), '');
  writeSide(path.join(dir, 'userFactors'), model.customerFactors, k, o.userIds);
  writeSide(path.join(dir, 'itemFactors'), model.itemFactors, k, o.itemIds);
}

function writeSide(dir: string, factors: Float32Array, k: number, ids: Int32Array | undefined): void {
  fs.mkdirSync(dir);
  const rows = factors.length / k;
  const job = crypto.randomUUID();
  for (let part = 0, start = 0; start < rows || part === 0; part++, start += ROWS_PER_PART) {
    const end = Math.min(rows, start + ROWS_PER_PART);
    const id = new Int32Array(end - start);
    const features: number[][] = [];
    for (let r = start; r < end; r++) {
      id[r - start] = ids ? ids[r]! : r;
      features.push(Array.from(factors.subarray(r * k, (r + 1) * k)));
    }
    parquetWriteFile({
      filename: path.join(dir, `part-${String(part).padStart(5, '0')}-${job}-c000.snappy.parquet`),
      columnData: [
        { name: 'id', data: id },
        { name: 'features', data: features },
      ],
      schema: [
        { name: 'spark_schema', num_children: 2 },
        { name: 'id', type: 'INT32', repetition_type: 'REQUIRED' },
        { name: 'features', repetition_type: 'OPTIONAL', converted_type: 'LIST', num_children: 1 },
        { name: 'list', repetition_type: 'REPEATED', num_children: 1 },
        { name: 'element', type: 'FLOAT', repetition_type: 'REQUIRED' },
      ],
    });
    if (end >= rows) break;
  }
  fs.writeFileSync(path.join(dir, '_SUCCESS'), '');
}
