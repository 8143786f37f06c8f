import type { Csr } from '../../src-main/core/matrix/csr.ts';
import { fitContent } from '../../src-main/core/models/content.ts';
import { fitEase } from '../../src-main/core/models/ease.ts';
import { fitItemKnn } from '../../src-main/core/models/itemknn.ts';
import { fitPopularity } from '../../src-main/core/models/popularity.ts';
import type { Scorer } from '../../src-main/core/models/scorer.ts';
import type { Dataset } from '../../src-main/core/types.ts';
import { fitIalsThreaded } from '../../src-main/services/train/ials-threads.ts';
import { TRAIN_EASE_DEFAULTS } from '../../src-main/services/train/train-models.ts';
import type { ModelRepo } from '../../src-main/store/models.ts';

export type StoredParams = Record<string, Record<string, unknown>>;

/** Each current model's stored parameters, by kind ({} for a kind not trained). */
export function currentParams(repo: ModelRepo): StoredParams {
  return Object.fromEntries(['content', 'itemknn', 'ials', 'ease', 'popularity'].map((k) => [k, repo.loadCurrent(k as never)?.params ?? {}])) as StoredParams;
}

/**
 * The five models fitted on `train` (the validation split's train part) with `params`, as training's blend stage
 * fits them (services/tune/blend.ts learnBlend), for the diagnostics that retrace the blend's choice.
 */
export async function fitForValidation(ds: Dataset, train: Csr, params: StoredParams, seed: number): Promise<Map<string, Scorer>> {
  const scorers = new Map<string, Scorer>();
  scorers.set('content', fitContent(ds.items, params.content as never).model);
  scorers.set('itemknn', fitItemKnn(train, params.itemknn as never).model);
  scorers.set('ials', (await fitIalsThreaded(train, { seed, ...(params.ials as object) }, {})).model);
  scorers.set('ease', fitEase(train, { ...TRAIN_EASE_DEFAULTS, ...(params.ease as object) }).model);
  scorers.set('popularity', fitPopularity(train, 'presence', (params.popularity?.['fitHalfLifeDays'] as number | null | undefined) ?? null).model);
  return scorers;
}
