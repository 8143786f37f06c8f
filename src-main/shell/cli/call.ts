import { invoke, type HandlerTable } from '../../api/handler-table.ts';
import type { MethodName, RequestOf, ResponseOf } from '../../api/contract.ts';
import type { ApiError } from '../../api/define.ts';

/** An api error surfaced to the command line; main() prints it and exits with the data-error code. */
export class CliApiError extends Error {
  readonly error: ApiError;
  constructor(error: ApiError) {
    const w = error.where;
    const at = w ? [w.file, w.line, w.column].filter((p) => p !== undefined).join(':') : '';
    super(at ? `${at}: ${error.message}` : error.message);
    this.error = error;
  }
}

/** Calls one api method through the same handler table (and schemas) as the app's shells. */
export async function call<M extends MethodName>(table: HandlerTable, name: M, payload: RequestOf<M>): Promise<ResponseOf<M>> {
  const r = await invoke(table, name, payload);
  if (!r.ok) throw new CliApiError(r.error);
  return r.value as ResponseOf<M>;
}
