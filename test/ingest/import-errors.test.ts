import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { InputError } from '../../src-main/core/errors.ts';
import { importFile, type ImportOptions } from '../../src-main/services/import.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { CUSTOMERS_CSV, ITEMS_CSV, SIGNALS_CSV, freshWorkspace, snapshot, tempDir, write } from './helpers.ts';

/**
 * Every failure leaves the workspace exactly as it was: each case compares the full contents of every
 * table (and the index list) before and after.
 */
const dir = tempDir();
let db: Db;
beforeAll(async () => {
  db = freshWorkspace(dir);
  await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS_CSV) });
  await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS_CSV) });
  await importFile(db, { target: 'signals', file: write(dir, 'signals.csv', SIGNALS_CSV) });
});
afterAll(() => {
  db.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

let n = 0;
async function rejected(target: ImportOptions['target'], content: string | Uint8Array, ext = 'csv', extra: Partial<ImportOptions> = {}) {
  const file = write(dir, `bad${++n}.${ext}`, content);
  const before = snapshot(db);
  const r = await importFile(db, { target, file, ...extra });
  expect(r.committed).toBe(false);
  expect(r.added + r.updated + r.unchanged).toBe(0);
  expect(snapshot(db)).toEqual(before);
  return { r, file };
}
async function refused(target: ImportOptions['target'], content: string | Uint8Array, ext = 'csv', extra: Partial<ImportOptions> = {}) {
  const file = write(dir, `refused${++n}.${ext}`, content);
  const before = snapshot(db);
  const e = await importFile(db, { target, file, ...extra }).then(() => undefined, (x: unknown) => x);
  expect(e).toBeInstanceOf(InputError);
  expect(snapshot(db)).toEqual(before);
  return { message: (e as InputError).describe(), file };
}

describe('rows that fail: the whole import changes nothing and each row is named file:line:column', () => {
  it('wrong types (a boolean column holding a word)', async () => {
    const { r, file } = await rejected('items', 'id,title,promoted\nb1,Changed,true\nn1,New,perhaps\n');
    expect(r.errors).toEqual([{ line: 3, column: 3, reason: "promoted: expected true/false, yes/no, y/n or 1/0, got 'perhaps'", message: `${file}:3:3: promoted: expected true/false, yes/no, y/n or 1/0, got 'perhaps'` }]);
  });
  it('missing ids', async () => {
    const { r } = await rejected('items', 'id,title\n,No Id\nn2,Fine\n');
    expect(r.errors[0]).toMatchObject({ line: 2, column: 1, reason: 'id: missing id' });
  });
  it('invalid dates, and slash dates without dateOrder', async () => {
    const { r } = await rejected('signals', 'customer,item,kind,at\nr1,b1,view,2026-02-30\nr1,b2,view,03/04/2026\n');
    expect(r.errors.map((e) => [e.line, e.column])).toEqual([[2, 4], [3, 4]]);
    expect(r.errors[0]!.reason).toMatch(/day out of range/);
    expect(r.errors[1]!.reason).toMatch(/day first or month first\? Choose the date order, dmy or mdy/);
  });
  it('negative or non-numeric prices and values', async () => {
    const { r } = await rejected('items', 'id,title,price\nb1,X,-2\nb2,Y,cheap\n');
    expect(r.errors.map((e) => e.reason)).toEqual(["price: must not be negative: '-2'", "price: not a number: 'cheap'"]);
    const s = await rejected('signals', 'customer,item,kind,value\nr1,b1,rating,-1\nr1,b1,rating,lots\n');
    expect(s.r.errorCount).toBe(2);
  });
  it('a row with the wrong number of fields', async () => {
    const { r } = await rejected('customers', 'id,region\nr7,east,extra\n');
    expect(r.errors[0]!.reason).toMatch(/3 fields but the header has 2/);
  });
  it('an unknown item is always rejected, even with unknown: create', async () => {
    const { r } = await rejected('signals', 'customer,item,kind\nnew-reader,ghost,view\n', 'csv', { unknown: 'create' });
    expect(r.errors[0]).toMatchObject({ line: 2, column: 2 });
    expect(r.errors[0]!.reason).toMatch(/unknown item 'ghost'; signals never create items/);
  });
  it('an unknown customer is rejected by default', async () => {
    const { r } = await rejected('signals', 'customer,item,kind\nstranger,b1,view\n');
    expect(r.errors[0]!.reason).toMatch(/unknown customer 'stranger'/);
    // The message says what to do, in the words of the command line the user typed.
    expect(r.errors[0]!.reason).toMatch(/import customers first, or let the import create them \(--create-customers/);
  });
  it('reports the first 100 errors and counts them all', async () => {
    const rows = Array.from({ length: 150 }, (_, i) => `x${i},T,-1`).join('\n');
    const { r } = await rejected('items', `id,title,price\n${rows}\n`);
    expect(r.errors).toHaveLength(100);
    expect(r.errorCount).toBe(150);
    expect(r.rejected).toBe(150);
  });
});

describe('files that cannot be read: InputError with file and line, nothing changed', () => {
  it('unknown columns in a mapping', async () => {
    expect((await refused('items', 'id,title\nq,Q\n', 'csv', { mapping: { title: 'Headline' } })).message).toMatch(
      /:1: mapping names column 'Headline' for title, but the file has no such column/,
    );
  });
  it('duplicate header columns', async () => {
    expect((await refused('items', 'id,title,title\nq,Q,R\n')).message).toMatch(/:1:3: duplicate header 'title' \(columns 2 and 3\)/);
  });
  it('invalid UTF-8, with the line of the bad byte', async () => {
    const bytes = Buffer.concat([Buffer.from('id,title\nq1,Fine\nq2,Caf'), Buffer.from([0xe9]), Buffer.from('\n')]); // Latin-1 é
    const { message, file } = await refused('items', bytes);
    expect(message).toBe(`${file}:3: the file is not valid UTF-8 text (byte 0xe9); save it as UTF-8 and import again`);
  });
  it('a file that is not CSV at all (a PNG)', async () => {
    // The 8-byte PNG signature and an IHDR chunk header (PNG specification, section 5.2 and 11.2.2).
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0, 0, 0]);
    expect((await refused('items', png, 'csv')).message).toMatch(/not a text file \(binary content/);
  });
  it('prose that is not a table', async () => {
    expect((await refused('items', 'Dear editor, here is the list you asked for.\nRegards\n')).message).toMatch(/missing required column id/);
  });
  it('an empty file', async () => {
    expect((await refused('items', '')).message).toMatch(/the file is empty/);
  });
  it('a header only', async () => {
    expect((await refused('items', 'id,title\r\n')).message).toMatch(/:2: the file has a header but no data rows/);
  });
  it('a missing required column', async () => {
    expect((await refused('signals', 'customer,kind\nr1,view\n')).message).toMatch(/missing required column item for signals/);
  });
  it('a CSV with an unclosed quote', async () => {
    expect((await refused('items', 'id,title\nq,"never closed\n')).message).toMatch(/not readable as CSV/);
  });
  it('invalid JSON, with line and column', async () => {
    expect((await refused('items', '[\n {"id": "a", "title": "A"},\n {"id": }\n]', 'json')).message).toMatch(/:3: not valid JSON: Unexpected token/);
  });
  it('invalid option values (zod at the boundary)', async () => {
    await expect(importFile(db, { target: 'items', file: 'x.csv', dateOrder: 'ymd' as 'dmy' })).rejects.toThrow(/import option dateOrder/);
  });
});

describe('acceptPartial', () => {
  it('commits the valid rows and reports the rejected ones', async () => {
    const file = write(dir, 'partial.csv', 'customer,item,kind,at\nr1,b3,view,2026-04-01T00:00:00Z\nr1,nope,view,2026-04-01T00:00:00Z\n');
    const r = await importFile(db, { target: 'signals', file, acceptPartial: true });
    expect(r).toMatchObject({ committed: true, rows: 2, added: 1, rejected: 1 });
    expect(r.errors[0]!.message).toBe(`${file}:3:2: item: unknown item 'nope'; signals never create items, import the catalogue first`);
  });
});
