/**
 * Model folders in Spark's `ALSModel.save` layout, written at run time by DuckDB (an independent Parquet
 * implementation, never our own writer) plus the metadata line as Spark writes it.
 *
 * Spark's source (apache/spark):
 * - ml/recommendation/ALS.scala, `ALSModelWriter.saveImpl`:
 *     val extraMetadata = "rank" -> instance.rank
 *     DefaultParamsWriter.saveMetadata(instance, path, sparkSession, Some(extraMetadata))
 *     instance.userFactors.write.format("parquet").save(userPath)   // userPath = path/userFactors
 *     instance.itemFactors.write.format("parquet").save(itemPath)   // itemPath = path/itemFactors
 *   and `userFactors.toDF("id", "features")` from `FeatureData(id: Int, features: Array[Float])`.
 * - ml/util/ReadWrite.scala, `getMetadataToSave`:
 *     ("class" -> cls) ~ ("timestamp" -> System.currentTimeMillis()) ~ ("sparkVersion" -> sc.version) ~
 *     ("uid" -> uid) ~ ("paramMap" -> jsonParams) ~ ("defaultParamMap" -> jsonDefaultParams)
 *   written by `saveAsTextFile(metadataPath)`: metadata/part-00000 and metadata/_SUCCESS.
 * Part files are named as Spark's writer names them (part-00000-<job uuid>-c000.snappy.parquet).
 */
import fs from 'node:fs';
import path from 'node:path';
import { DuckDBInstance, type DuckDBConnection } from '@duckdb/node-api';

let shared: Promise<DuckDBConnection> | null = null;
export function duck(): Promise<DuckDBConnection> {
  shared ??= DuckDBInstance.create(':memory:').then((d) => d.connect());
  return shared;
}

/** Spark's metadata line for an implicit ALS fit (the paramMap keys are ALS's own Param names). */
export function sparkMetadata(o: { rank: number; className?: string; implicitPrefs?: boolean; regParam?: number; alpha?: number }): string {
  return JSON.stringify({
    class: o.className ?? 'org.apache.spark.ml.recommendation.ALSModel',
    timestamp: 1764806400000,
    sparkVersion: '3.5.1',
    uid: 'ALS_5e1f2c3d4b6a',
    paramMap: { implicitPrefs: o.implicitPrefs ?? true, rank: o.rank, regParam: o.regParam ?? 0.05, alpha: o.alpha ?? 2, maxIter: 10, userCol: 'customer', itemCol: 'item', ratingCol: 'rating' },
    defaultParamMap: { blockSize: 4096, coldStartStrategy: 'nan', predictionCol: 'prediction', nonnegative: false, checkpointInterval: 10, seed: -1517157561 },
    rank: o.rank,
  });
}

/**
 * A factor value both DuckDB and the test can compute: ((id·7 + f·3) mod 11 − 5) / 10, f = 0..rank−1.
 * `bad` rows replace their factors with the SQL expression given (NaN, a short list...).
 */
export const factorValue = (id: number, f: number): number => Math.fround((((id * 7 + f * 3) % 11) - 5) / 10);

export interface SideSpec {
  /** Ids written, in file order. */
  ids: number[];
  rank: number;
  /** id → SQL list expression replacing that row's features (for refusals). */
  bad?: Record<number, string>;
  /** Split into this many part files. */
  parts?: number;
  /** Parquet compression (default snappy, Spark's). */
  compression?: string;
}

export async function writeSide(dir: string, s: SideSpec): Promise<void> {
  fs.mkdirSync(dir, { recursive: true });
  const c = await duck();
  const parts = s.parts ?? 1;
  const per = Math.ceil(s.ids.length / parts);
  for (let p = 0; p < parts; p++) {
    const ids = s.ids.slice(p * per, (p + 1) * per);
    if (ids.length === 0) continue;
    const cases = Object.entries(s.bad ?? {}).map(([id, expr]) => `WHEN id = ${id} THEN ${expr}`).join(' ');
    const features = `list_transform(range(${s.rank}), f -> ((((id * 7 + f * 3) % 11) - 5) / 10)::FLOAT)`;
    const file = path.join(dir, `part-${String(p).padStart(5, '0')}-6f1c0f3e-2b4d-4e8a-9c1a-3d5e7f9a1b2c-c000.snappy.parquet`);
    await c.run(
      `COPY (SELECT id::INTEGER AS id, ${cases ? `CASE ${cases} ELSE ${features} END` : features} AS features
             FROM unnest([${ids.join(',')}]::BIGINT[]) AS t(id))
       TO '${file}' (FORMAT parquet, COMPRESSION ${s.compression ?? 'snappy'})`,
    );
  }
  fs.writeFileSync(path.join(dir, '_SUCCESS'), '');
}

export async function writeSparkModelDir(
  dir: string,
  o: { rank: number; users: SideSpec; items: SideSpec; metadata?: string },
): Promise<void> {
  fs.mkdirSync(path.join(dir, 'metadata'), { recursive: true });
  fs.writeFileSync(path.join(dir, 'metadata', 'part-00000'), `${o.metadata ?? sparkMetadata({ rank: o.rank })}\n`);
  fs.writeFileSync(path.join(dir, 'metadata', '_SUCCESS'), '');
  await writeSide(path.join(dir, 'userFactors'), o.users);
  await writeSide(path.join(dir, 'itemFactors'), o.items);
}

export const range = (n: number): number[] => Array.from({ length: n }, (_, i) => i);
