/**
 * Taste groups as an editor sees them: each group's size, cohesion, separation and silhouette, its
 * description by lift and example items, and its name carried across trainings by member overlap.
 */
import { describeGroups, matchNames, type GroupSettings, type LiftEntry } from '../../core/audience/index.ts';
import { InputError, NotFoundError } from '../../core/errors.ts';
import type { Dataset } from '../../core/types.ts';
import { deleteGroupName, readGroupNames, readGroupSettings, writeGroupName, writeGroupSettings } from '../../store/taste-groups.ts';
import type { Db } from '../../store/workspace.ts';
import { currentGrouping, groupsFor } from './model-source.ts';

export interface TasteGroupView {
  group: number;
  name: string | null;
  /** Jaccard overlap with the members the name was given to (0 when unnamed). */
  nameOverlap: number;
  customers: number;
  signals: number;
  cohesion: number;
  nearest: number;
  separation: number;
  silhouette: number | null;
  categories: LiftEntry[];
  tags: LiftEntry[];
  examples: { id: string; title: string; category: string }[];
}

export interface TasteGroupsView {
  k: number;
  settings: GroupSettings;
  criterion: string;
  tried: { k: number; silhouette: number }[];
  silhouette: number;
  sampled: number;
  notEnoughHistory: number;
  customers: number;
  groups: TasteGroupView[];
  /** Names whose group is no longer found (it split, merged or dissolved). */
  unmatchedNames: string[];
}

function denseIndex(ds: Dataset): Map<number, number> {
  const m = new Map<number, number>();
  ds.customerIds.forEach((id, u) => m.set(id, u));
  return m;
}

export function tasteGroupsView(db: Db, ds: Dataset): TasteGroupsView {
  const g = currentGrouping(db, ds);
  const assignment = groupsFor(ds, g);
  const dense = denseIndex(ds);
  const stored = readGroupNames(db).map((n) => ({ name: n.name, members: n.members.map((c) => dense.get(c) ?? -1) }));
  const match = matchNames(assignment, g.k, stored);
  const described = describeGroups(ds, assignment, g.k);
  return {
    k: g.k,
    settings: g.settings,
    criterion: 'mean silhouette (Rousseeuw 1987) on a seeded sample of customers, largest wins',
    tried: g.tried,
    silhouette: g.silhouette,
    sampled: g.sampled,
    notEnoughHistory: g.notEnoughHistory + Math.max(0, ds.customerIds.length - g.assignment.length),
    customers: ds.customerIds.length,
    groups: g.groups.map((s, j) => {
      const d = described[j]!;
      return {
        group: j,
        name: match.names[j] ?? null,
        nameOverlap: match.overlap[j] ?? 0,
        customers: d.customers,
        signals: d.signals,
        cohesion: s.cohesion,
        nearest: s.nearest,
        separation: s.separation,
        silhouette: Number.isNaN(s.silhouette) ? null : s.silhouette,
        categories: d.categories,
        tags: d.tags,
        examples: d.examples.map((i) => ({ id: ds.items[i]!.externalId, title: ds.items[i]!.title, category: ds.items[i]!.category })),
      };
    }),
    unmatchedNames: match.unmatched,
  };
}

/** Names group `group` of the current grouping; the name follows its members into later trainings. */
export function nameTasteGroup(db: Db, ds: Dataset, group: number, name: string): TasteGroupsView {
  const clean = name.trim();
  if (clean.length === 0 || clean.length > 60) throw new InputError('a group name needs 1 to 60 characters');
  const view = tasteGroupsView(db, ds);
  const target = view.groups[group];
  if (!target) throw new NotFoundError(`no group ${group}: there are ${view.k} groups (0 to ${view.k - 1})`);
  const assignment = groupsFor(ds, currentGrouping(db, ds));
  const members: number[] = [];
  assignment.forEach((g, u) => {
    if (g === group) members.push(ds.customerIds[u]!);
  });
  writeGroupName(db, clean, members, target.name);
  return tasteGroupsView(db, ds);
}

export function forgetTasteGroupName(db: Db, ds: Dataset, name: string): TasteGroupsView {
  if (!deleteGroupName(db, name.trim())) throw new NotFoundError(`no group is named '${name.trim()}'`);
  return tasteGroupsView(db, ds);
}

/** Changes the range k is chosen in and the history needed; bad settings change nothing. */
export function setTasteGroupSettings(db: Db, ds: Dataset, s: Partial<GroupSettings>): TasteGroupsView {
  writeGroupSettings(db, { ...readGroupSettings(db), ...s });
  return tasteGroupsView(db, ds);
}
