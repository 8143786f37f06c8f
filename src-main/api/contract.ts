import type { z } from 'zod';
import { clusterMethods } from './contracts/cluster.ts';
import { curationMethods } from './contracts/curation.ts';
import { dataMethods } from './contracts/data.ts';
import { jobMethods } from './contracts/jobs.ts';
import { modelMethods } from './contracts/models.ts';
import { pictureMethods } from './contracts/pictures.ts';
import { planningMethods } from './contracts/planning.ts';
import { workspaceMethods } from './contracts/workspace.ts';

/**
 * The whole api: every method by name. Areas add their methods in contracts/<area>.ts and list them here.
 * The renderer imports this file (schemas and types only).
 */
export const CONTRACT = {
  ...workspaceMethods,
  ...jobMethods,
  ...dataMethods,
  ...curationMethods,
  ...modelMethods,
  ...pictureMethods,
  ...planningMethods,
  ...clusterMethods,
} as const;

export type Contract = typeof CONTRACT;
export type MethodName = keyof Contract;
export type RequestOf<M extends MethodName> = z.input<Contract[M]['request']>;
export type ResponseOf<M extends MethodName> = z.output<Contract[M]['response']>;

export function isMethodName(name: string): name is MethodName {
  return Object.prototype.hasOwnProperty.call(CONTRACT, name);
}
