import type { AppContext } from '../services/context.ts';
import { CONTRACT, isMethodName, type Contract, type MethodName, type RequestOf, type ResponseOf } from './contract.ts';
import type { ApiResult } from './define.ts';
import { toApiError } from './errors.ts';
import { pathFieldsIn, pathRefusal } from './path-fields.ts';
import { clusterHandlers } from './handlers/cluster.ts';
import { curationHandlers } from './handlers/curation.ts';
import { dataHandlers } from './handlers/data.ts';
import { jobHandlers } from './handlers/jobs.ts';
import { modelHandlers } from './handlers/models.ts';
import { pictureHandlers } from './handlers/pictures.ts';
import { planningHandlers } from './handlers/planning.ts';
import { workspaceHandlers } from './handlers/workspace.ts';

type Parsed<M extends MethodName> = import('zod').output<Contract[M]['request']>;
export type Handler<M extends MethodName> = (req: Parsed<M>) => ResponseOf<M> | Promise<ResponseOf<M>>;
export type HandlerTable = { [M in MethodName]: Handler<M> };

/** The one handler table every shell maps its transport onto. Areas contribute their part. */
export function createHandlerTable(ctx: AppContext): HandlerTable {
  const table: HandlerTable = {
    ...workspaceHandlers(ctx),
    ...jobHandlers(ctx),
    ...dataHandlers(ctx),
    ...curationHandlers(ctx),
    ...modelHandlers(ctx),
    ...pictureHandlers(ctx),
    ...planningHandlers(ctx),
    ...clusterHandlers(ctx),
  };
  contexts.set(table, ctx);
  return table;
}

/** Each table's context, so an error can name the open workspace's file. */
const contexts = new WeakMap<HandlerTable, AppContext>();

export interface InvokeOptions {
  /**
   * 'allow' (the command line, Electron's main process): request fields that name files on this machine
   * are used. 'refuse' (the web shell): a request carrying any field of PATH_FIELDS is refused before its
   * handler runs, so no file outside the workspace is read or written on a web request.
   */
  serverPaths?: 'allow' | 'refuse';
}

/**
 * Calls one method by name with an untrusted payload: the request is parsed with its schema, the
 * response too (a handler returning the wrong shape is our bug, caught here before it reaches a client).
 */
export async function invoke(table: HandlerTable, name: string, payload: unknown, options: InvokeOptions = {}): Promise<ApiResult<unknown>> {
  if (!isMethodName(name)) return { ok: false, error: { code: 'input', message: `unknown method: ${name}` } };
  try {
    const spec = CONTRACT[name];
    const req = spec.request.parse(payload ?? {});
    // Checked on the parsed request: exactly what the handler would be given.
    const named = options.serverPaths === 'refuse' ? pathFieldsIn(name, req)[0] : undefined;
    if (named) return { ok: false, error: { code: 'input', message: pathRefusal(named) } };
    const handler = table[name] as (r: unknown) => unknown;
    const res = await handler(req);
    return { ok: true, value: spec.response.parse(res) };
  } catch (e) {
    const ctx = contexts.get(table);
    return { ok: false, error: toApiError(e, ctx?.isOpen ? ctx.file : undefined) };
  }
}

export type { RequestOf, ResponseOf };
