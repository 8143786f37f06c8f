/**
 * The tuning search's budget, in plain fits: tuning may spend this many times what one fit of every searched
 * model at its defaults costs (on the validation split's train part, each fit with its measurement), every cost
 * predicted from the data's sizes (services/tune/trial-cost.ts), not read from the clock, so a loaded machine
 * runs the same trials as an idle one.
 * Default 3: issue 10 item 5 bounds default tuning by 3 plain fits of all models. Measured on Online Retail
 * (2 cores, load average about 8, back to back): `train` with tuning 58 s wall, 45 CPU-s, against 32 s wall,
 * 19 CPU-s for `train --no-tune` (every model on all signals plus the validated blend): the whole tuned run,
 * including the larger iALS it chose (128 factors), is 1.8× wall and 2.4× CPU of a plain one; what
 * lies outside the per-model pool (building the split, measuring each trial) is included. Here in core so the
 * api contract and the renderer can state the same bounds as the tuner (services/tune/grid.ts).
 */
export const TUNE_BUDGET = { default: 3, min: 0.5, max: 20 } as const;
