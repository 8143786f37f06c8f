/**
 * The curation world's models: the workspace's current trained models (services/propose.ts), iALS item
 * factors as the similarity vectors of the meter and MMR when iALS is trained, and taste groups found by
 * k-means++ over the iALS customer factors (core/audience/kmeans.ts). Groups are seeded, so the same model
 * gives the same groups and a brief's "group 2" keeps meaning the same people until the next training.
 */
import { describeGroups, kMeans, type GroupDescription, type KMeansResult } from '../../core/audience/index.ts';
import { InputError } from '../../core/errors.ts';
import { IalsModel } from '../../core/models/ials.ts';
import { seededRng } from '../../core/rng.ts';
import type { Dataset } from '../../core/types.ts';
import type { Db } from '../../store/workspace.ts';
import { blendOf } from '../holdout/trained.ts';
import { loadCurrentModels } from '../propose.ts';
import type { ModelSource } from './world.ts';

/** Six groups: enough to tell a shop's main tastes apart, few enough to name (common practice, no source). */
export const GROUP_COUNT = 6;
export const GROUP_SEED = 20260101;

const groupCache = new WeakMap<IalsModel, Map<string, KMeansResult>>();

export function tasteGroups(model: IalsModel, k = GROUP_COUNT, seed = GROUP_SEED): KMeansResult {
  let byKey = groupCache.get(model);
  if (!byKey) groupCache.set(model, (byKey = new Map()));
  const key = `${k}:${seed}`;
  let r = byKey.get(key);
  if (!r) {
    r = kMeans(model.customerFactors, model.customerCount, model.factors, k, seededRng(seed));
    byKey.set(key, r);
  }
  return r;
}

function ialsOf(db: Db, ds: Dataset): IalsModel | null {
  const m = loadCurrentModels(db, ds).models;
  for (const s of [m.affinity, m.collaborative]) if (s instanceof IalsModel) return s;
  return null;
}

/** Group of each dense customer; customers who joined after training get -1 (in no group). */
function groupsFor(ds: Dataset, r: KMeansResult): Int32Array {
  const out = new Int32Array(ds.customerIds.length).fill(-1);
  out.set(r.assignment.subarray(0, Math.min(out.length, r.assignment.length)));
  return out;
}

export const curationModelSource: ModelSource = (db, ds) => {
  const loaded = loadCurrentModels(db, ds);
  const ials = ialsOf(db, ds);
  const blend = () => blendOf(db, ds);
  if (!ials || ials.customerCount < GROUP_COUNT) return { models: loaded.models, blend };
  return {
    models: loaded.models,
    blend,
    vectors: { data: ials.itemFactors, dim: ials.factors },
    groups: groupsFor(ds, tasteGroups(ials)),
  };
};

/** The discovered taste groups, each described by its top categories and tags by lift. */
export function describeTasteGroups(db: Db, ds: Dataset, k = GROUP_COUNT, seed = GROUP_SEED): GroupDescription[] {
  const ials = ialsOf(db, ds);
  if (!ials) throw new InputError('taste groups come from the iALS model: train the models first');
  return describeGroups(ds, groupsFor(ds, tasteGroups(ials, k, seed)), k);
}
