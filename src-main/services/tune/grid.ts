/**
 * The tuning grids (issue 6 item 4), small enough that the demo shop (2,500 items, 400k signals) tunes in a
 * couple of minutes on two cores. Values bracket each method's defaults by factors of about 3–10, the usual
 * first pass of a log-scale search (common practice, no source).
 *
 * iALS is searched in two stages so that its four parameters cost 7 fits instead of 16: first confidence
 * scaling × α at the smaller factor count (Hu, Koren & Volinsky 2008 §4: linear c = 1 + αr and log
 * c = 1 + α·log(1 + r/ε)), then factors × regularisation with the best scaling and α.
 *
 * A parameter the caller fixed replaces that parameter in every grid point (withFixed), and the points that
 * become equal are tried once.
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

/** The parameters each model's grid varies (the hybrid's content weight has no training flag to fix it). */
export const GRID_PARAMS = {
  itemknn: ['k', 'shrink'],
  ials: ['factors', 'regularization', 'alpha', 'scaling'],
  ease: ['lambda'],
} as const;

export type GridModel = keyof typeof GRID_PARAMS;

/**
 * Grid parameters the caller fixed (train.start's own values): the search holds each at the caller's value and
 * varies only the rest of that model's grid, so the settings chosen beside it are chosen for the value trained.
 */
export type FixedParams = { [M in GridModel]?: Partial<Record<(typeof GRID_PARAMS)[M][number], number | string>> };

/** The grid parameters among training parameters (iterations, seed and the like are not searched, so not "fixed"). */
export function fixedParams(params: { [M in GridModel]?: object } | undefined): FixedParams {
  const out: Record<string, Record<string, number | string>> = {};
  for (const model of Object.keys(GRID_PARAMS) as GridModel[]) {
    const given = params?.[model] as Record<string, unknown> | undefined;
    const held: Record<string, number | string> = {};
    for (const param of GRID_PARAMS[model]) {
      const v = given?.[param];
      if (typeof v === 'number' || typeof v === 'string') held[param] = v;
    }
    if (Object.keys(held).length) out[model] = held;
  }
  return out as FixedParams;
}

/** True when the caller fixed every parameter the model's grid varies: there is nothing to search. */
export function fullyFixed(model: GridModel, fixed: FixedParams): boolean {
  const held = (fixed[model] ?? {}) as Record<string, unknown>;
  return GRID_PARAMS[model].every((p) => held[p] !== undefined);
}

/**
 * The grid points with the fixed parameters set to the caller's values, duplicates dropped (the first of
 * equals kept, so grid order is kept). Only parameters a point has are set.
 */
export function withFixed<T extends object>(points: readonly T[], fixed: object | undefined): T[] {
  const held = (fixed ?? {}) as Record<string, unknown>;
  const seen = new Set<string>();
  const out: T[] = [];
  for (const p of points) {
    const q = { ...p } as Record<string, unknown>;
    for (const key of Object.keys(q)) if (held[key] !== undefined) q[key] = held[key];
    const id = JSON.stringify(q);
    if (seen.has(id)) continue;
    seen.add(id);
    out.push(q as T);
  }
  return out;
}
