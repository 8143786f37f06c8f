export * from './actions.ts';
export * from './log.ts';
export * from './snapshot.ts';
