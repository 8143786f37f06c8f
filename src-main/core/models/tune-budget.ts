/**
 * The tuning search's budget, in plain fits: tuning may spend this many times what one fit of every searched
 * model at its defaults costs (measured on the validation split's train part). Default 3 (issue 10 item 5:
 * tuning by default stays within three plain fits). Here in core so the api contract and the renderer can
 * state the same bounds as the tuner (services/tune/grid.ts).
 */
export const TUNE_BUDGET = { default: 3, min: 0.5, max: 20 } as const;
