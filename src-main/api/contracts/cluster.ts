import { z } from 'zod';
import { method } from '../define.ts';

/**
 * Training on a cluster, curating here (docs/cluster.md): the signals go out as Parquet with an id map, and a
 * Spark ALSModel folder comes back as the workspace's iALS model. Both name folders on this machine, so the
 * web shell refuses them (api/path-fields.ts); they are for the command line and Electron.
 */
export const ModelOriginView = z.object({
  source: z.literal('cluster'),
  engine: z.string(),
  importedAt: z.number(),
  savedAt: z.number().nullable(),
  sparkVersion: z.string(),
  rank: z.number().int(),
  regParam: z.number().nullable(),
  alpha: z.number().nullable(),
  maxIter: z.number().nullable(),
  exportedAt: z.number(),
  customersFoldedIn: z.number().int(),
  itemsFoldedIn: z.number().int().optional(),
  itemsWithoutFactors: z.number().int(),
  /** "trained on a cluster (Spark 3.5.1 ALS), imported 2026-12-04, rank 128" */
  description: z.string(),
});

export const clusterMethods = {
  'signals.export': method({
    summary: 'Write the interaction matrix (kind weights, optional time decay) and its id maps as Parquet into a new folder, for Spark.',
    request: z.object({ out: z.string().min(1), halfLifeDays: z.number().positive().optional() }).strict(),
    response: z.object({
      out: z.string(),
      files: z.array(z.string()),
      customers: z.number().int(),
      items: z.number().int(),
      signals: z.number().int(),
      fingerprint: z.string(),
    }),
  }),
  'model.import': method({
    summary: "Store a Spark ALSModel folder as the workspace's iALS model, ids mapped back through the export's id map.",
    request: z.object({ dir: z.string().min(1), idsFolder: z.string().min(1).optional() }).strict(),
    response: z.object({ modelId: z.number().int(), origin: ModelOriginView, stale: z.boolean(), notes: z.array(z.string()) }),
  }),
};
