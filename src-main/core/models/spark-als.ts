import { InputError } from '../errors.ts';
import type { IalsParams } from './ials-params.ts';

/**
 * What Spark's `ALSModel.save` writes into `metadata/` and how its parameters map onto ours.
 *
 * The metadata is one line of JSON written by `DefaultParamsWriter.saveMetadata` (Spark's
 * mllib/src/main/scala/org/apache/spark/ml/util/ReadWrite.scala, `getMetadataToSave`):
 *   ("class" -> cls) ~ ("timestamp" -> System.currentTimeMillis()) ~ ("sparkVersion" -> sc.version) ~
 *   ("uid" -> uid) ~ ("paramMap" -> jsonParams) ~ ("defaultParamMap" -> jsonDefaultParams)
 * plus the extra field the ALSModel writer adds (ml/recommendation/ALS.scala, `ALSModelWriter.saveImpl`:
 * `val extraMetadata = "rank" -> instance.rank`). `paramMap` holds the parameters set explicitly,
 * `defaultParamMap` the defaults (absent before Spark 2.4); Spark's reader looks in `paramMap` first
 * (`Metadata.getParamValue`), and so do we.
 */
export const ALS_MODEL_CLASS = 'org.apache.spark.ml.recommendation.ALSModel';

export interface SparkAlsMetadata {
  className: string;
  uid: string;
  /** Unix ms when Spark saved the model. */
  timestamp: number;
  sparkVersion: string;
  rank: number;
  /** The parameters the model was fitted with, where the metadata holds them (null: not recorded). */
  regParam: number | null;
  alpha: number | null;
  maxIter: number | null;
  implicitPrefs: boolean | null;
  seed: number | null;
}

/** Largest rank we take: the same bound as our own factors (ials-params.ts). */
const MAX_RANK = 1024;

/**
 * Parses and checks the metadata line. `file` names the file in every refusal. Refuses JSON that is not
 * Spark's metadata, a model of another class, a rank that is not a positive integer up to 1024, and a
 * model fitted with `implicitPrefs = false` (explicit ratings: a different objective, not Hu et al.'s).
 */
export function parseAlsMetadata(text: string, file: string): SparkAlsMetadata {
  const where = { file, line: 1 };
  const firstLine = text.split('\n', 1)[0] ?? '';
  let json: unknown;
  try {
    json = JSON.parse(firstLine);
  } catch (e) {
    throw new InputError(`not Spark model metadata: the first line is not JSON (${(e as Error).message})`, where);
  }
  if (json === null || typeof json !== 'object' || Array.isArray(json)) throw new InputError('not Spark model metadata: the first line is not a JSON object', where);
  const o = json as Record<string, unknown>;
  if (typeof o['class'] !== 'string') throw new InputError('not Spark model metadata: it has no "class" field', where);
  if (o['class'] !== ALS_MODEL_CLASS) {
    throw new InputError(`a model of another kind: the metadata says class ${o['class']}; only ${ALS_MODEL_CLASS} (Spark's ALS) can be imported`, where);
  }
  const rank = o['rank'];
  if (typeof rank !== 'number' || !Number.isInteger(rank) || rank < 1 || rank > MAX_RANK) {
    throw new InputError(`the model's rank must be an integer from 1 to ${MAX_RANK}, the metadata says ${JSON.stringify(rank)}`, { ...where, column: 'rank' });
  }
  const param = (name: string): unknown => {
    for (const section of ['paramMap', 'defaultParamMap']) {
      const m = o[section];
      if (m !== null && typeof m === 'object' && Object.prototype.hasOwnProperty.call(m, name)) return (m as Record<string, unknown>)[name];
    }
    return undefined;
  };
  const num = (name: string): number | null => {
    const v = param(name);
    return typeof v === 'number' && Number.isFinite(v) ? v : null;
  };
  const implicit = param('implicitPrefs');
  const implicitPrefs = typeof implicit === 'boolean' ? implicit : null;
  if (implicitPrefs === false) {
    throw new InputError(
      'the model was fitted with implicitPrefs=false (explicit ratings), a different objective: fit ALS(implicitPrefs=True, ...) as docs/cluster.md shows',
      { ...where, column: 'implicitPrefs' },
    );
  }
  return {
    className: o['class'],
    uid: typeof o['uid'] === 'string' ? o['uid'] : '',
    timestamp: typeof o['timestamp'] === 'number' ? o['timestamp'] : Number.NaN,
    sparkVersion: typeof o['sparkVersion'] === 'string' ? o['sparkVersion'] : 'unknown',
    rank,
    regParam: num('regParam'),
    alpha: num('alpha'),
    maxIter: num('maxIter'),
    implicitPrefs,
    seed: num('seed'),
  };
}

/** Spark's documented defaults (ALS.scala `setDefault(rank -> 10, maxIter -> 10, regParam -> 0.1, ..., alpha -> 1.0)`). */
export const SPARK_ALS_DEFAULTS = { regParam: 0.1, alpha: 1, maxIter: 10 } as const;

/**
 * The parameters the imported model is stored and folded in with. Spark's confidence is ours, linear:
 * ALS.scala adds `c1 = alpha * math.abs(rating)` to the confidence 1 for every rating > 0, so c = 1 + α·r
 * (Hu et al. 2008, eq. 2), with preference 1 where r > 0. Its λ is weighted by the row's count of positive
 * entries (`numExplicits * regParam`), which `regularizationScaling: 'signals'` reproduces when a customer
 * is folded in.
 */
export function importedIalsParams(m: SparkAlsMetadata): IalsParams {
  return {
    factors: m.rank,
    regularization: m.regParam ?? SPARK_ALS_DEFAULTS.regParam,
    regularizationScaling: 'signals',
    alpha: m.alpha ?? SPARK_ALS_DEFAULTS.alpha,
    scaling: 'linear',
    epsilon: 1,
    iterations: m.maxIter ?? SPARK_ALS_DEFAULTS.maxIter,
    cgSteps: 3,
    seed: m.seed !== null && Number.isSafeInteger(m.seed) ? m.seed : 1,
  };
}

/**
 * Our λ that asks for about the same shrinkage as Spark's regParam: Spark solves row u with λ·n_u, we with
 * one λ for every row, so regParam × the median count of positive entries per customer row is the closest
 * single value (the median, so a few very active customers do not set it). Used only where our own
 * trainer refits with the imported model's settings (the split-based `evaluate`); an approximation, said so
 * in docs/cluster.md.
 */
export function equivalentRegularization(regParam: number, medianSignalsPerCustomer: number): number {
  return regParam * Math.max(1, medianSignalsPerCustomer);
}
