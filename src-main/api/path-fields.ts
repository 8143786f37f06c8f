import type { MethodName } from './contract.ts';

/**
 * Every api request field that names a file on the machine running Shelfwright. They are for the command
 * line and Electron's main process, where the person at the keyboard names their own files. The web shell
 * refuses any request that carries one (`invoke(..., { serverPaths: 'refuse' })`): whoever holds its token
 * would otherwise read or write any file the app's account can, and in the web shell files come in as
 * uploads and go out as downloads instead (DESIGN.md, Reliability and safety rules).
 *
 * A new field that takes a path must be listed here; test/api/path-fields.test.ts fails on a request field
 * whose name says file, path, folder or out and that is not listed, and drives every entry through the
 * web shell as an attacker would.
 */
export interface PathField {
  method: MethodName;
  /** Dotted path of the field inside the request, e.g. `source.file`. */
  field: string;
  /** What the method does with the file. */
  use: 'read' | 'write' | 'open or create';
  /** What to do instead in the web page, said in the refusal. */
  instead: string;
}

const UPLOAD = 'choose the file in the page (Import screen: "upload a file") so it is sent as an upload';

export const PATH_FIELDS: readonly PathField[] = [
  { method: 'workspace.open', field: 'file', use: 'open or create', instead: 'to work on another workspace, restart with `npm start -- --workspace FILE`' },
  { method: 'workspace.demo', field: 'file', use: 'write', instead: 'build the demo with `shelfwright demo` at the command line' },
  { method: 'import.preview', field: 'file', use: 'read', instead: UPLOAD },
  { method: 'import.preview', field: 'mappingFile', use: 'read', instead: 'send the column mapping itself as `mapping`' },
  { method: 'import.run', field: 'file', use: 'read', instead: UPLOAD },
  { method: 'import.run', field: 'mappingFile', use: 'read', instead: 'send the column mapping itself as `mapping`' },
  { method: 'evaluate.holdout', field: 'source.file', use: 'read', instead: 'choose the held-out file in the page, which sends its content' },
  { method: 'recommend', field: 'customersFile', use: 'read', instead: 'send the customer ids themselves as `customers`' },
  { method: 'recommend', field: 'out', use: 'write', instead: 'write the file with `shelfwright recommend --out FILE` at the command line' },
  { method: 'signals.export', field: 'out', use: 'write', instead: 'export with `shelfwright export signals --format parquet --out DIR` at the command line' },
  // idsFolder first: a request always carries dir too, and the refusal names the first field listed.
  { method: 'model.import', field: 'idsFolder', use: 'read', instead: 'import with `shelfwright import model DIR --ids EXPORT_DIR` at the command line' },
  { method: 'model.import', field: 'dir', use: 'read', instead: 'import with `shelfwright import model DIR` at the command line' },
];

/** The value at a dotted path inside a parsed request, or undefined. Own properties only. */
function valueAt(request: unknown, dotted: string): unknown {
  let v: unknown = request;
  for (const key of dotted.split('.')) {
    if (v === null || typeof v !== 'object' || !Object.prototype.hasOwnProperty.call(v, key)) return undefined;
    v = (v as Record<string, unknown>)[key];
  }
  return v;
}

/** The path fields a request for `method` actually carries (present and not undefined). */
export function pathFieldsIn(method: string, request: unknown): PathField[] {
  return PATH_FIELDS.filter((f) => f.method === method && valueAt(request, f.field) !== undefined);
}

/** The refusal a shell without server paths answers, naming the field and what to do instead. */
export function pathRefusal(f: PathField): string {
  const harm = f.use === 'read' ? 'read' : 'overwrite';
  return `${f.field}: the web shell takes no paths on the computer it runs on (with one, anything holding its token could ${harm} files outside the workspace); ${f.instead}`;
}
