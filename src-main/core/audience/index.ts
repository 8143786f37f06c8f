export * from './kmeans.ts';
export * from './describe.ts';
