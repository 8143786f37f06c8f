/**
 * The curation world's models: the workspace's current trained models (services/propose.ts), iALS item
 * factors as the similarity vectors of the meter and MMR when iALS is trained, and taste groups found in
 * the iALS customer factors (core/audience/taste-groups.ts: unit vectors, k chosen by silhouette). Groups
 * are seeded, so the same model and settings give the same groups, and a brief's "group 2" keeps meaning the
 * same people until the next training or a change of the settings; a brief aimed at a named group follows
 * the name (matched by member overlap) across trainings instead.
 */
import { findTasteGroups, matchNames, type GroupSettings, type TasteGrouping } from '../../core/audience/index.ts';
import { InputError } from '../../core/errors.ts';
import { signalsByCustomer } from '../../core/matrix/by-customer.ts';
import { IalsModel } from '../../core/models/ials.ts';
import type { Dataset } from '../../core/types.ts';
import { readGroupNames, readGroupSettings } from '../../store/taste-groups.ts';
import type { Db } from '../../store/workspace.ts';
import { blendOf } from '../holdout/trained.ts';
import { loadCurrentModels } from '../propose.ts';
import type { ModelSource } from './world.ts';

export const GROUP_SEED = 20260101;

const groupCache = new WeakMap<IalsModel, Map<string, TasteGrouping>>();

/** Distinct items of each of the first `customers` dense customers. */
export function historyLengths(ds: Dataset, customers: number): Int32Array {
  const n = Math.min(customers, ds.customerIds.length);
  const { ptr, signal } = signalsByCustomer(ds.signals, ds.customerIds.length);
  const last = new Int32Array(ds.items.length).fill(-1);
  const out = new Int32Array(customers);
  for (let u = 0; u < n; u++) {
    for (let p = ptr[u]!, end = ptr[u + 1]!; p < end; p++) {
      const i = ds.signals.item[signal[p]!]!;
      if (last[i] === u) continue;
      last[i] = u;
      out[u]!++;
    }
  }
  return out;
}

export function tasteGroups(model: IalsModel, ds: Dataset, settings: GroupSettings, seed = GROUP_SEED): TasteGrouping {
  let byKey = groupCache.get(model);
  if (!byKey) groupCache.set(model, (byKey = new Map()));
  // The history is read from the dataset: the same model over more signals may admit more customers.
  const key = `${settings.minK}:${settings.maxK}:${settings.minHistory}:${seed}:${ds.signals.length}`;
  let r = byKey.get(key);
  if (!r) {
    r = findTasteGroups(model.customerFactors, model.customerCount, model.factors, historyLengths(ds, model.customerCount), settings, { seed });
    byKey.set(key, r);
  }
  return r;
}

export function ialsOf(db: Db, ds: Dataset): IalsModel | null {
  const m = loadCurrentModels(db, ds).models;
  for (const s of [m.affinity, m.collaborative]) if (s instanceof IalsModel) return s;
  return null;
}

/** Group of each dense customer; customers who joined after training get -1 (in no group). */
export function groupsFor(ds: Dataset, r: TasteGrouping): Int32Array {
  const out = new Int32Array(ds.customerIds.length).fill(-1);
  out.set(r.assignment.subarray(0, Math.min(out.length, r.assignment.length)));
  return out;
}

/** The editor's name of each group of `grouping` now, by member overlap (core/audience/names.ts). */
export function groupNamesFor(db: Db, ds: Dataset, grouping: TasteGrouping, assignment: Int32Array): (string | null)[] {
  const dense = new Map<number, number>();
  ds.customerIds.forEach((id, u) => dense.set(id, u));
  const stored = readGroupNames(db).map((n) => ({ name: n.name, members: n.members.map((c) => dense.get(c) ?? -1) }));
  return matchNames(assignment, grouping.k, stored).names;
}

/** The groups of the current iALS model under the workspace's settings, or null with the reason. */
export function currentGrouping(db: Db, ds: Dataset): TasteGrouping {
  const ials = ialsOf(db, ds);
  if (!ials) throw new InputError('taste groups come from the iALS model: train the models first');
  return tasteGroups(ials, ds, readGroupSettings(db));
}

export const curationModelSource: ModelSource = (db, ds) => {
  const loaded = loadCurrentModels(db, ds);
  const ials = ialsOf(db, ds);
  const blend = () => blendOf(db, ds);
  if (!ials) return { models: loaded.models, blend };
  const vectors = { data: ials.itemFactors, dim: ials.factors };
  let groups: Int32Array | undefined;
  let groupNames: (string | null)[] | undefined;
  try {
    const grouping = tasteGroups(ials, ds, readGroupSettings(db));
    groups = groupsFor(ds, grouping);
    groupNames = groupNamesFor(db, ds, grouping, groups);
  } catch (e) {
    // Too few customers with enough history for groups: everything else still works; briefs aimed at a
    // group are refused by resolveAudience with its own message.
    if (!(e instanceof InputError)) throw e;
  }
  return groups && groupNames ? { models: loaded.models, blend, vectors, groups, groupNames } : { models: loaded.models, blend, vectors };
};
