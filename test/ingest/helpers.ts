import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';

/** A fresh directory per test file; removed by `cleanup`. */
export function tempDir(prefix = 'shelfwright-ingest-'): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), prefix));
}

export function freshWorkspace(dir: string, name = 'w.shelf'): Db {
  return openWorkspace(path.join(dir, name));
}

export function write(dir: string, name: string, content: string | Uint8Array): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, content);
  return file;
}

/** Every row of every table the importer writes, in a stable order: "unchanged" means deep-equal to this. */
export function snapshot(db: Db): Record<string, unknown[]> {
  const out: Record<string, unknown[]> = {};
  for (const t of ['item', 'customer', 'signal', 'import_log']) out[t] = db.prepare(`SELECT * FROM ${t} ORDER BY id`).all();
  out.indexes = db.prepare("SELECT name, sql FROM sqlite_master WHERE type = 'index' ORDER BY name").all();
  return out;
}

export const ITEMS_CSV =
  'id,title,description,category,tags,supplier,price,added_at,promoted,available\n' +
  'b1,Moss Lantern,A slow tale of lamps,fiction,night|lamps,Quillby Press,12.50,2026-01-05,false,true\n' +
  'b2,Tin Orchard,"Short stories, mostly about rain",fiction,rain|short,Quillby Press,9.00,2026-02-10,true,true\n' +
  'b3,Salt Atlas,Maps of imaginary coasts,maps,,Harrowgate Folio,30,2026-03-01,false,false\n';
export const CUSTOMERS_CSV = 'id,region,joined_at\nr1,north,2025-11-02\nr2,south,2025-12-24\n';
export const SIGNALS_CSV =
  'customer,item,kind,value,at\n' +
  'r1,b1,view,1,2026-03-14T09:26:53Z\n' +
  'r1,b1,purchase,1,2026-03-14T09:30:00Z\n' +
  'r2,b2,rating,4,2026-03-15T10:00:00Z\n' +
  'r2,b3,read,1,\n';
