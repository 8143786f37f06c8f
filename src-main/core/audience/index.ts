export * from './kmeans.ts';
export * from './describe.ts';
export * from './ari.ts';
export * from './silhouette.ts';
export * from './taste-groups.ts';
export * from './names.ts';
