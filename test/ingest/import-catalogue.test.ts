import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { importFile, previewImport } from '../../src-main/services/import.ts';
import { ItemRepo } from '../../src-main/store/items.ts';
import { CUSTOMERS_CSV, ITEMS_CSV, freshWorkspace, snapshot, tempDir, write } from './helpers.ts';

const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let k = 0;
const ws = () => freshWorkspace(dir, `w${++k}.shelf`);

describe('importFile: items', () => {
  it("imports the demo generator's items.csv with every field converted", async () => {
    const db = ws();
    const r = await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS_CSV) });
    expect(r).toMatchObject({ rows: 3, added: 3, updated: 0, unchanged: 0, rejected: 0, committed: true, format: 'csv', delimiter: ',' });
    expect(r.mapping).toMatchObject({ id: 'id', title: 'title', added_at: 'added_at', available: 'available' });
    const b2 = new ItemRepo(db).byExternalId('b2')!;
    expect(b2).toMatchObject({
      title: 'Tin Orchard', description: 'Short stories, mostly about rain', category: 'fiction', tags: ['rain', 'short'],
      supplier: 'Quillby Press', price: 9, addedAt: Date.UTC(2026, 1, 10), promoted: true, available: true, attributes: {},
    });
    expect(new ItemRepo(db).byExternalId('b3')).toMatchObject({ tags: [], available: false, price: 30 });
  });

  it('importing the same file twice changes nothing the second time', async () => {
    const db = ws();
    const file = write(dir, 'items2.csv', ITEMS_CSV);
    await importFile(db, { target: 'items', file });
    const before = snapshot(db);
    const r = await importFile(db, { target: 'items', file });
    expect(r).toMatchObject({ added: 0, updated: 0, unchanged: 3, committed: true });
    const after = snapshot(db);
    expect(after.item).toEqual(before.item);
    expect(after.import_log).toHaveLength(before.import_log!.length + 1);
  });

  it('a later row with the same id wins, and a partial file updates only its columns', async () => {
    const db = ws();
    await importFile(db, { target: 'items', file: write(dir, 'i3.csv', ITEMS_CSV) });
    const r = await importFile(db, {
      target: 'items',
      file: write(dir, 'prices.csv', 'sku,price,in_stock\nb1,14.00,no\nb1,15.00,no\nb2,9.00,yes\n'),
    });
    expect(r).toMatchObject({ rows: 3, added: 0, updated: 2, unchanged: 1 });
    const b1 = new ItemRepo(db).byExternalId('b1')!;
    expect(b1).toMatchObject({ price: 15, available: false, title: 'Moss Lantern', tags: ['night', 'lamps'] });
  });

  it('keeps unknown columns as free attributes, and reads semicolon files with decimal commas', async () => {
    const db = ws();
    const file = write(dir, 'semi.csv', 'Item ID;Name;Price;Pages;Format\nx1;Paper Kite;4,50;120;paperback\n');
    const r = await importFile(db, { target: 'items', file });
    expect(r).toMatchObject({ delimiter: ';', added: 1, mapping: { id: 'Item ID', title: 'Name', price: 'Price' } });
    expect(new ItemRepo(db).byExternalId('x1')).toMatchObject({ price: 4.5, attributes: { Pages: '120', Format: 'paperback' } });
  });

  it('uses an explicit mapping and a mapping file (validated with zod)', async () => {
    const db = ws();
    const file = write(dir, 'odd.csv', 'ref,label,grp\nz1,Glass Harbour,poetry\n');
    const mappingFile = write(dir, 'map.json', JSON.stringify({ id: 'ref', title: 'label' }));
    const r = await importFile(db, { target: 'items', file, mappingFile, mapping: { category: 'grp' } });
    expect(r.mapping).toEqual({ id: 'ref', title: 'label', category: 'grp' });
    expect(new ItemRepo(db).byExternalId('z1')).toMatchObject({ title: 'Glass Harbour', category: 'poetry' });
    const bad = write(dir, 'badmap.json', JSON.stringify({ ident: 'ref' }));
    await expect(importFile(db, { target: 'items', file, mappingFile: bad })).rejects.toThrow(/mapping file/);
  });

  it('reads JSON arrays (with typed values) and JSON Lines', async () => {
    const db = ws();
    const json = write(dir, 'items.json', JSON.stringify([
      { id: 'j1', title: 'Wren Ledger', tags: ['birds', 'ledgers'], price: 3, promoted: true, pages: 88 },
      { id: 'j2', title: 'Cold Bell', added_at: 1773480413 },
    ], null, 2));
    expect(await importFile(db, { target: 'items', file: json })).toMatchObject({ format: 'json', added: 2 });
    expect(new ItemRepo(db).byExternalId('j1')).toMatchObject({ tags: ['birds', 'ledgers'], price: 3, promoted: true, attributes: { pages: 88 } });
    expect(new ItemRepo(db).byExternalId('j2')!.addedAt).toBe(1_773_480_413_000);
    const jsonl = write(dir, 'items.jsonl', '{"id":"j3","title":"Lamp Street"}\n\n{"id":"j1","title":"Wren Ledger II"}\n');
    expect(await importFile(db, { target: 'items', file: jsonl })).toMatchObject({ format: 'jsonl', rows: 2, added: 1, updated: 1 });
  });
});

describe('importFile: customers', () => {
  it('imports customers with the other columns as attributes, idempotently', async () => {
    const db = ws();
    const file = write(dir, 'customers.csv', CUSTOMERS_CSV);
    expect(await importFile(db, { target: 'customers', file })).toMatchObject({ added: 2, committed: true });
    expect(await importFile(db, { target: 'customers', file })).toMatchObject({ added: 0, updated: 0, unchanged: 2 });
    const row = db.prepare("SELECT attributes FROM customer WHERE external_id = 'r2'").pluck().get() as string;
    expect(JSON.parse(row)).toEqual({ region: 'south', joined_at: '2025-12-24' });
  });
});

describe('previewImport', () => {
  it('shows format, delimiter, headers, detected mapping, at most 20 sample rows and row problems', async () => {
    const rows = Array.from({ length: 30 }, (_, i) => `u${i}\tp${i}\t${i === 3 ? 'teleport' : 'cart'}\t${i}`);
    const file = write(dir, 'sig.tsv', 'User_ID\tSKU\tEvent\tQty\n' + rows.join('\n') + '\n');
    const p = await previewImport(file, 'signals');
    expect(p).toMatchObject({ format: 'csv', delimiter: '\t', headers: ['User_ID', 'SKU', 'Event', 'Qty'] });
    expect(p.mapping).toEqual({ customer: 'User_ID', item: 'SKU', kind: 'Event', value: 'Qty' });
    expect(p.sampleRows).toHaveLength(20);
    expect(p.sampleRows[0]).toEqual(['u0', 'p0', 'cart', '0']);
    expect(p.problems).toEqual([`${file}:5:3: kind: unknown kind 'teleport'; expected one of view, basket, purchase, rating, read, click, other`]);
  });
  it('reports a file-level problem instead of throwing', async () => {
    const p = await previewImport(write(dir, 'nohead.csv', 'foo,bar\n1,2\n'), 'signals');
    expect(p.problems[0]).toMatch(/nohead.csv:1: missing required columns customer, item, kind/);
  });
});
