import { isMethodName, type MethodName, type RequestOf, type ResponseOf } from '../../src-main/api/contract.ts';
import type { ApiError, ApiResult } from '../../src-main/api/define.ts';

/** Carries one api call to whichever shell runs the page: HTTP (web shell) or IPC (Electron preload). */
export type Transport = (method: string, payload: unknown) => Promise<ApiResult<unknown>>;

/** An api failure as the page sees it: the code decides how to show it, the message is for people. */
export class ApiCallError extends Error {
  override readonly name = 'ApiCallError';
  readonly code: ApiError['code'];
  readonly where: ApiError['where'];
  constructor(error: ApiError) {
    super(error.message);
    this.code = error.code;
    this.where = error.where;
  }
}

/** A file sent to the main side as a stream (web shell: POST /upload), for files too big for an api call. */
export interface StagedUpload {
  /** The id `import.preview` and `import.run` take as `upload`. */
  upload: string;
  bytes: number;
}
export type Uploader = (file: File) => Promise<StagedUpload>;

export interface Client {
  call<M extends MethodName>(method: M, payload: RequestOf<M>): Promise<ResponseOf<M>>;
  /**
   * Whether this shell takes paths on the main side's machine (api/path-fields.ts): Electron does; the web
   * shell refuses them, so there the page offers uploads and downloads only, never a path field.
   */
  serverPaths: boolean;
  /** Present where the shell can take a streamed file (the web shell); absent in Electron for now. */
  upload?: Uploader;
}

/**
 * The single way the renderer talks to the main side. Responses were parsed by the api's schemas on the
 * other side already; here a failed result becomes an ApiCallError so screens can catch it where the
 * user acted.
 */
export function createClient(transport: Transport, uploader?: Uploader, options: { serverPaths?: boolean } = {}): Client {
  return {
    // Off unless the shell says so: a path field the shell refuses would only lead to an error.
    serverPaths: options.serverPaths ?? false,
    ...(uploader && {
      async upload(file: File) {
        try {
          return await uploader(file);
        } catch (e) {
          if (e instanceof ApiCallError) throw e;
          throw new ApiCallError({ code: 'internal', message: `The file could not be sent to Shelfwright (${(e as Error).message}).` });
        }
      },
    }),
    async call(method, payload) {
      if (!isMethodName(method)) throw new ApiCallError({ code: 'input', message: `unknown method: ${String(method)}` });
      let result: ApiResult<unknown>;
      try {
        result = await transport(method, payload);
      } catch (e) {
        throw new ApiCallError({
          code: 'internal',
          message: `Shelfwright is not answering (${(e as Error).message}). Check that it is still running, then reload the page.`,
        });
      }
      if (!result.ok) throw new ApiCallError(result.error);
      return result.value as ResponseOf<typeof method>;
    },
  };
}

/** Plain-language text for a caught error, with what to do next when the code says it. */
export function describeError(e: unknown): string {
  if (e instanceof ApiCallError) {
    // Services often name the file in the message already; repeat only what it does not say.
    const parts = e.where ? [e.where.file, e.where.line, e.where.column].filter((x) => x !== undefined) : [];
    const at = parts.length === 1 && e.where?.file !== undefined && e.message.includes(e.where.file) ? '' : parts.join(':');
    const next =
      e.code === 'internal'
        ? ' If this keeps happening, restart Shelfwright.'
        : e.code === 'not_found'
          ? ' It may have been removed; refresh the view.'
          : '';
    return `${at ? `${at}: ` : ''}${e.message}${next}`;
  }
  return e instanceof Error ? e.message : String(e);
}
