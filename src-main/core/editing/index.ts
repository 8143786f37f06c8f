export * from './actions.ts';
export * from './ban-scope.ts';
export * from './log.ts';
export * from './snapshot.ts';
