/**
 * The tuning search's budget, in plain fits: tuning may spend this many times what one fit of every searched
 * model at its defaults costs (measured on the validation split's train part, each fit with its measurement).
 * Default 2: issue 10 item 5 bounds default tuning by 3 plain fits, and what lies outside the per-model budget
 * (building the split, measuring each trial) cost about 30% more
 * on the real log (budget 3 spent 3.9× a plain `train`'s CPU time there, 2.1× on the demo shop). Here in core so the api contract and the renderer can
 * state the same bounds as the tuner (services/tune/grid.ts).
 */
export const TUNE_BUDGET = { default: 2, min: 0.5, max: 20 } as const;
