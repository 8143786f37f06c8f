import fc from 'fast-check';

/**
 * Property tests run from one fixed seed, so a red CI run can be replayed exactly and a green one is not luck.
 * To explore new cases locally, run with FC_SEED=<number> (or FC_SEED=random).
 */
const fromEnv = process.env['FC_SEED'];
fc.configureGlobal({ seed: fromEnv === 'random' ? Date.now() : fromEnv ? Number(fromEnv) : 20_261_202 });
