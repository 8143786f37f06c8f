/**
 * An imported model's origin in words. Kept apart from import-model.ts so the models list (and with it every
 * command's start-up) does not load the Parquet reader.
 */
import type { ModelOrigin } from '../../store/models.ts';

/** "trained on a cluster (Spark 3.5.1 ALS), imported 2026-12-04, rank 128" — the line the app and the CLI show. */
export function describeOrigin(o: ModelOrigin): string {
  return `trained on a cluster (Spark ${o.sparkVersion} ALS), imported ${new Date(o.importedAt).toISOString().slice(0, 10)}, rank ${o.rank}`;
}
