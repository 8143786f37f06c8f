import type { z } from 'zod';

/**
 * One api method: the schema of its request and of its response. Every shell (Electron IPC, the loopback
 * web server, the command line) parses both with these, so all ways in get the same checks.
 */
export interface MethodSpec<Req extends z.ZodType = z.ZodType, Res extends z.ZodType = z.ZodType> {
  summary: string;
  request: Req;
  response: Res;
}

export function method<Req extends z.ZodType, Res extends z.ZodType>(spec: MethodSpec<Req, Res>): MethodSpec<Req, Res> {
  return spec;
}

/** What crosses a process boundary when something goes wrong: never a stack. */
export interface ApiError {
  code: 'input' | 'not_found' | 'cancelled' | 'conflict' | 'internal';
  message: string;
  where?: { file?: string; line?: number; column?: number | string };
}

export type ApiResult<T> = { ok: true; value: T } | { ok: false; error: ApiError };
