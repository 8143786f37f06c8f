/**
 * Item-level look-ups for editors: an item's neighbours, explained by component, and a title / id search for
 * pickers. Neighbours use the same current models as proposals (services/propose.ts).
 */
import { DEFAULT_WEIGHTS } from '../core/editing/brief-schema.ts';
import { NotFoundError } from '../core/errors.ts';
import { DEFAULT_COLD_START_MIN_CUSTOMERS } from '../core/scoring/index.ts';
import { ItemRepo, searchItemsByIdOrTitle } from '../store/items.ts';
import type { Db } from '../store/workspace.ts';
import { loadWorld } from './curation/world.ts';
import { loadCurrentModels, storedModelSource } from './propose.ts';

export interface ItemBrief {
  item: string;
  title: string;
  category: string;
  promoted: boolean;
}

export interface SimilarItem extends ItemBrief {
  score: number;
  /** Cosine similarity under the content model (TF-IDF + attributes); null when no content model. */
  content: number | null;
  /** Similarity under the collaborative model (item-kNN, else EASE, else iALS); null when none. */
  collaborative: number | null;
  mainReason: 'content' | 'collaborative';
  coldStart: boolean;
}

/**
 * The n items most like `externalId`. Order: the brief-default weights of the two similarity components
 * (content 0.3, collaborative 0.35; DEFAULT_WEIGHTS), renormalised over the available ones, applied to the
 * raw similarities; ties by external id, lower first. Each neighbour carries both raw similarities, so the
 * screen can say "similar description and tags" apart from "bought by the same people".
 */
export function similarItems(db: Db, externalId: string, n: number): { item: ItemBrief; neighbours: SimilarItem[]; notes: string[] } {
  const found = new ItemRepo(db).byExternalId(externalId);
  if (!found) throw new NotFoundError(`no item '${externalId}' in the catalogue`);
  const world = loadWorld(db, storedModelSource);
  const { ds } = world;
  const loaded = loadCurrentModels(db, ds);
  const i = world.ctx.indexOfId.get(found.id)!;
  const N = ds.items.length;
  const { content, collaborative } = loaded.models;
  const c = content ? new Float32Array(N) : null;
  const k = collaborative ? new Float32Array(N) : null;
  if (c) content!.similarityInto(i, c);
  if (k) collaborative!.similarityInto(i, k);
  const wc = c ? DEFAULT_WEIGHTS.content : 0;
  const wk = k ? DEFAULT_WEIGHTS.collaborative : 0;
  const total = wc + wk;
  const notes = [...loaded.notes];
  if (total === 0) return { item: brief(found), neighbours: [], notes: [...notes, 'no similarity model is available: run train first'] };
  if (collaborative) notes.push(`collaborative similarity from ${collaborative.kind}`);
  const score = new Float64Array(N);
  for (let j = 0; j < N; j++) score[j] = ((c ? wc * c[j]! : 0) + (k ? wk * k[j]! : 0)) / total;
  const order = Array.from({ length: N }, (_, j) => j).filter((j) => j !== i && score[j]! > 0);
  order.sort((a, b) => score[b]! - score[a]! || (ds.items[a]!.externalId < ds.items[b]!.externalId ? -1 : 1));
  const neighbours = order.slice(0, n).map((j): SimilarItem => {
    const cj = c ? c[j]! : null;
    const kj = k ? k[j]! : null;
    return {
      ...brief(ds.items[j]!),
      score: score[j]!,
      content: cj,
      collaborative: kj,
      mainReason: wc * (cj ?? 0) >= wk * (kj ?? 0) ? 'content' : 'collaborative',
      coldStart: world.customersPerItem[j]! < DEFAULT_COLD_START_MIN_CUSTOMERS,
    };
  });
  return { item: brief(found), neighbours, notes };
}

/** The catalogue search (store/items.ts searchItemsByIdOrTitle), as briefs. */
export function searchItems(db: Db, query: string, limit: number): ItemBrief[] {
  return searchItemsByIdOrTitle(db, query, limit).map(brief);
}

function brief(it: { externalId: string; title: string; category: string; promoted: boolean }): ItemBrief {
  return { item: it.externalId, title: it.title, category: it.category, promoted: it.promoted };
}
