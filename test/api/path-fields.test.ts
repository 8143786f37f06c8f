import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { CONTRACT, type MethodName } from '../../src-main/api/contract.ts';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { PATH_FIELDS, pathFieldsIn } from '../../src-main/api/path-fields.ts';
import { AppContext } from '../../src-main/services/context.ts';

/** Request fields whose names look like paths but are not: each says why. */
const NOT_PATHS: Record<string, string> = {
  fileName: 'the name an uploaded file had on the editor’s computer: shown in reports, never opened',
  'source.fileName': 'the same, for a held-out file sent with its content',
};

/** Does a field's name say it holds a file or folder? (`out`, `outFile`, `...File`, `...Path`, `...Dir`, `...Folder`) */
const LOOKS_LIKE_A_PATH = /(^|\.)(out($|[A-Z])|[^.]*(file|path|dir|folder))/i;

interface ZodDef {
  type: string;
  shape?: Record<string, z.ZodType>;
  innerType?: z.ZodType;
  options?: z.ZodType[];
  in?: z.ZodType;
  out?: z.ZodType;
  element?: z.ZodType;
  valueType?: z.ZodType;
  left?: z.ZodType;
  right?: z.ZodType;
}

/** Every field (dotted) a request schema accepts, through optional, default, union, pipe and arrays. */
function requestFields(schema: z.ZodType, prefix = '', out = new Set<string>()): Set<string> {
  const def = (schema as unknown as { _zod: { def: ZodDef } })._zod.def;
  const next = (s: z.ZodType | undefined, p = prefix) => s && requestFields(s, p, out);
  switch (def.type) {
    case 'object':
      for (const [k, v] of Object.entries(def.shape ?? {})) {
        out.add(prefix + k);
        next(v, `${prefix}${k}.`);
      }
      break;
    case 'optional':
    case 'nullable':
    case 'default':
    case 'prefault':
    case 'readonly':
    case 'nonoptional':
    case 'catch':
      next(def.innerType);
      break;
    case 'union':
      for (const o of def.options ?? []) next(o);
      break;
    case 'pipe':
      next(def.in);
      next(def.out);
      break;
    case 'array':
      next(def.element, `${prefix}[].`);
      break;
    case 'record':
      next(def.valueType, `${prefix}*.`);
      break;
    case 'intersection':
      next(def.left);
      next(def.right);
      break;
    default:
      break;
  }
  return out;
}

describe('PATH_FIELDS', () => {
  it('lists every request field whose name says it is a file, and only fields that exist', () => {
    const unlisted: string[] = [];
    for (const [method, spec] of Object.entries(CONTRACT)) {
      const fields = requestFields(spec.request);
      for (const f of fields) {
        // "profile" holds "file" but names a customer's profile (the profile half-lives), never a path.
        if (!LOOKS_LIKE_A_PATH.test(f.replace(/profile/gi, '')) || f in NOT_PATHS) continue;
        if (!PATH_FIELDS.some((p) => p.method === method && p.field === f)) unlisted.push(`${method} ${f}`);
      }
      for (const p of PATH_FIELDS.filter((x) => x.method === method)) expect(fields.has(p.field), `${method} ${p.field}`).toBe(true);
    }
    expect(unlisted).toEqual([]);
    for (const p of PATH_FIELDS) expect(Object.keys(CONTRACT)).toContain(p.method);
  });

  it('finds the fields a request carries, at their dotted place, own properties only', () => {
    expect(pathFieldsIn('evaluate.holdout', { source: { file: '/x' }, k: 5 }).map((f) => f.field)).toEqual(['source.file']);
    expect(pathFieldsIn('evaluate.holdout', { source: { fileName: 'a.csv', content: '' } })).toEqual([]);
    expect(pathFieldsIn('recommend', { customersFile: '/a', out: '/b' }).map((f) => f.field)).toEqual(['customersFile', 'out']);
    expect(pathFieldsIn('import.run', Object.create({ file: '/inherited' }) as object)).toEqual([]);
    expect(pathFieldsIn('workspace.info', { file: '/x' })).toEqual([]);
  });
});

describe("invoke's serverPaths option", () => {
  it('refuses a path field before the handler runs, and names the field and what to do instead', async () => {
    let called = false;
    const table = { ...createHandlerTable(new AppContext()), 'workspace.open': () => ((called = true), { open: false, file: null, schemaVersion: null, items: 0, customers: 0, signals: 0 }) };
    const r = await invoke(table, 'workspace.open' satisfies MethodName, { file: '/etc/passwd' }, { serverPaths: 'refuse' });
    expect(r).toEqual({
      ok: false,
      error: {
        code: 'input',
        message:
          'file: the web shell takes no paths on the computer it runs on (with one, anything holding its token could overwrite files outside the workspace); to work on another workspace, restart with `npm start -- --workspace FILE`',
      },
    });
    expect(called).toBe(false);
    // The command line and Electron keep them (the default).
    await invoke(table, 'workspace.open', { file: '/etc/passwd' });
    expect(called).toBe(true);
  });
});
