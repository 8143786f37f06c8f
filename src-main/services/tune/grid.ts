/**
 * The tuning grids (issue 6 item 4), small enough that the demo shop (2,500 items, 400k signals) tunes in a
 * couple of minutes on two cores. Values bracket each method's defaults by factors of about 3–10, the usual
 * first pass of a log-scale search (common practice, no source).
 *
 * iALS is searched in two stages so that its four parameters cost 7 fits instead of 16: first confidence
 * scaling × α at the smaller factor count (Hu, Koren & Volinsky 2008 §4: linear c = 1 + αr and log
 * c = 1 + α·log(1 + r/ε)), then factors × regularisation with the best scaling and α.
 */
import type { IalsParams } from '../../core/models/ials-params.ts';

export const ITEMKNN_GRID = { k: [20, 50, 100], shrink: [0, 10, 50] } as const;

export const EASE_GRID = { lambda: [100, 500, 2000] } as const;

export const IALS_CONFIDENCE_GRID: readonly Pick<IalsParams, 'scaling' | 'alpha'>[] = [
  { scaling: 'linear', alpha: 1 },
  { scaling: 'linear', alpha: 10 },
  { scaling: 'log', alpha: 1 },
  { scaling: 'log', alpha: 10 },
];

export const IALS_SIZE_GRID: readonly Pick<IalsParams, 'factors' | 'regularization'>[] = [
  { factors: 32, regularization: 0.01 },
  { factors: 32, regularization: 0.1 },
  { factors: 64, regularization: 0.01 },
  { factors: 64, regularization: 0.1 },
];

/** Weight of the content component in the hybrid blend, the other weights held (brief defaults: 0.3). */
export const HYBRID_CONTENT_GRID = [0, 0.1, 0.3, 0.6, 1] as const;

/** Every (k, shrink) pair of the item-kNN grid. */
export function itemKnnTrials(): { k: number; shrink: number }[] {
  return ITEMKNN_GRID.k.flatMap((k) => ITEMKNN_GRID.shrink.map((shrink) => ({ k, shrink })));
}
