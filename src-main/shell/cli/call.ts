import { invoke, type HandlerTable } from '../../api/handler-table.ts';
import { CONTRACT, type MethodName, type RequestOf, type ResponseOf } from '../../api/contract.ts';
import type { ApiError } from '../../api/define.ts';
import type { IssueLike } from '../../core/curation/rule-words.ts';
import { SchemaRefusal } from './flag-fields.ts';

const REPEATED = /^([\w.[\]-]+): \1[: ]/;

/**
 * The line a terminal shows for an api error: `file:line:column: message`. Many checks name their field both
 * as `where.column` and at the start of the message ("slot: slot must be..."), and schema errors repeat their
 * path ("a.b: a.b: ..."); a prefix the message already starts with is given once.
 */
export function describeApiError(error: ApiError): string {
  const w = error.where;
  const at = w ? [w.file, w.line, w.column].filter((p) => p !== undefined && p !== '').join(':') : '';
  let message = error.message;
  for (let m = REPEATED.exec(message); m; m = REPEATED.exec(message)) message = message.slice(m[1]!.length + 2);
  const startsWithAt = at !== '' && (message.startsWith(`${at}:`) || message.startsWith(`${at} `));
  return at && !startsWithAt ? `${at}: ${message}` : message;
}

/** An api error surfaced to the command line; main() prints it and exits with the data-error code. */
export class CliApiError extends Error {
  readonly error: ApiError;
  constructor(error: ApiError) {
    super(describeApiError(error));
    this.error = error;
  }
}

/**
 * Calls one api method through the same handler table (and schemas) as the app's shells. A request the
 * method's schema refuses was built from the command line's flags, so it is a usage error (exit 1); main()
 * says it as the flag that set the field (flag-fields.ts).
 */
export async function call<M extends MethodName>(table: HandlerTable, name: M, payload: RequestOf<M>): Promise<ResponseOf<M>> {
  const checked = CONTRACT[name].request.safeParse(payload);
  if (!checked.success) {
    throw new SchemaRefusal(name, checked.error.issues[0] as IssueLike, payload);
  }
  const r = await invoke(table, name, payload);
  if (!r.ok) throw new CliApiError(r.error);
  return r.value as ResponseOf<M>;
}
