import fs from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { MESSAGE_VALUE_CHARS } from '../../src-main/core/util/cut.ts';
import { runImport } from '../../src-main/ingest/run.ts';
import { importFile } from '../../src-main/services/import.ts';
import { CUSTOMERS_CSV, ITEMS_CSV, freshWorkspace, tempDir, write } from './helpers.ts';

/** Issue 11 part 4: values echoed in messages are cut; the stored import log stays small. */
const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('huge cells in messages and in the import log', () => {
  it('cuts a 5 MB id to about 80 characters and an ellipsis in the message, and stores a small log row', async () => {
    const db = freshWorkspace(dir, 'huge.shelf');
    await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS_CSV) });
    await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS_CSV) });
    const huge = 'x'.repeat(5 << 20);
    const file = write(dir, 'huge.csv', `customer,item,kind\nr1,${huge},view\nr1,b1,view\n`);
    const r = await importFile(db, { target: 'signals', file, acceptPartial: true });
    expect(r).toMatchObject({ rejected: 1, added: 1, committed: true });
    const reason = r.errors[0]!.reason;
    expect(reason).toBe(`item: unknown item '${'x'.repeat(MESSAGE_VALUE_CHARS - 1)}…'; signals never create items, import the catalogue first`);
    expect(r.errors[0]!.message.length).toBeLessThan(file.length + 300);
    const logged = db.prepare('SELECT length(report) FROM import_log ORDER BY id DESC LIMIT 1').pluck().get() as number;
    expect(logged).toBeLessThan(10_000);
    db.pragma('wal_checkpoint(TRUNCATE)');
    expect(fs.statSync(path.join(dir, 'huge.shelf')).size).toBeLessThan(1 << 20);
  });

  it('cuts a long header named in a header error', async () => {
    const db = freshWorkspace(dir, 'header.shelf');
    const long = 'h'.repeat(10_000);
    const file = write(dir, 'dup-header.csv', `id,${long},${long}\nb1,x,y\n`);
    const e = await importFile(db, { target: 'items', file }).then(() => undefined, (x: unknown) => x as Error);
    expect(e?.message).toBe(`duplicate header '${'h'.repeat(MESSAGE_VALUE_CHARS - 1)}…' (columns 2 and 3)`);
  });
});

describe('control characters', () => {
  it('refuses them in ids of items, customers and signals, naming the character (ECMA-48 C0, DEL and C1)', async () => {
    const db = freshWorkspace(dir, 'controls.shelf');
    const items = await importFile(db, { target: 'items', file: write(dir, 'ctl-items.csv', 'id,title\n"b\u001b[2J1",Lamp\nb\u00852,Jar\nb3,Bowl\n') });
    expect(items).toMatchObject({ committed: false, rejected: 2 });
    expect(items.errors.map((e) => e.reason)).toEqual([
      "id: an id may not hold control characters; 'b?[2J1' has U+001B at character 2",
      "id: an id may not hold control characters; 'b?2' has U+0085 at character 2",
    ]);
    const customers = await importFile(db, { target: 'customers', file: write(dir, 'ctl-customers.jsonl', '{"id":"r\\u0007"}\n') });
    expect(customers.errors[0]?.reason).toBe("id: an id may not hold control characters; 'r?' has U+0007 at character 2");
    const signals = await importFile(db, { target: 'signals', file: write(dir, 'ctl-signals.csv', 'customer,item,kind\nr\u007f,b3,view\n'), unknown: 'create' });
    expect(signals.errors[0]?.reason).toBe("customer: an id may not hold control characters; 'r?' has U+007F at character 2");
  });

  it('keeps them in titles (they are the shop\'s text), where the command line shows them escaped', async () => {
    const db = freshWorkspace(dir, 'title.shelf');
    await importFile(db, { target: 'items', file: write(dir, 'ctl-title.csv', 'id,title\nb1,"Lamp\u001b]0;owned\u0007\u001b[2J"\n') });
    expect(db.prepare("SELECT title FROM item WHERE external_id = 'b1'").pluck().get()).toBe('Lamp\u001b]0;owned\u0007\u001b[2J');
  });
});

describe('dates: impossible years refused, dates after today counted', () => {
  const catalogue = async (name: string) => {
    const db = freshWorkspace(dir, name);
    await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS_CSV) });
    await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS_CSV) });
    return db;
  };

  it('refuses years before 1000 and after 9999 (ISO 8601 four-digit years), in every date form', async () => {
    const db = await catalogue('years.shelf');
    const file = write(dir, 'years.csv',
      'customer,item,kind,at\n' +
      'r1,b1,view,0099-01-01T00:00:00Z\n' + // the fast path's form; Date.UTC once made it 1999
      'r1,b1,view,0999-06-01\n' +
      'r1,b1,view,01/02/0050\n' +
      'r1,b1,view,9999999999999999\n' + // unix ms in the year 318,857
      'r1,b1,view,1000-01-01T00:00:00Z\n' +
      'r1,b1,view,9999-12-31T23:59:59Z\n');
    const r = await importFile(db, { target: 'signals', file, dateOrder: 'dmy' });
    expect(r.errors.map((e) => `${e.line}: ${e.reason}`)).toEqual([
      "2: at: year 99 out of range (years run from 1000 to 9999): '0099-01-01T00:00:00Z'",
      "3: at: year 999 out of range (years run from 1000 to 9999): '0999-06-01'",
      "4: at: year 50 out of range (years run from 1000 to 9999): '01/02/0050' (read as dmy)",
      "5: at: year out of range: '9999999999999999' as unix milliseconds is after the year 9999; years run from 1000 to 9999",
    ]);
    // The bounds themselves are fine; both instants checked against the proleptic Gregorian calendar as
    // ECMAScript's Date.UTC counts it for four-digit years (ECMA-262, "MakeDay").
    const ok = await importFile(db, { target: 'signals', file: write(dir, 'bounds.csv', 'customer,item,kind,at\nr1,b1,view,1000-01-01T00:00:00Z\nr1,b2,view,9999-12-31T23:59:59Z\n') });
    expect(ok).toMatchObject({ committed: true, added: 2 });
    expect(db.prepare('SELECT at FROM signal ORDER BY at').pluck().all()).toEqual([-30_610_224_000_000, 253_402_300_799_000]);
  });

  it('counts signals dated after today and warns, in both parsing paths, without refusing them', async () => {
    const file = write(dir, 'future.csv', 'customer,item,kind,at\nr1,b1,view,2026-01-02T00:00:00Z\nr1,b2,view,2999-05-01T00:00:00Z\nr2,b3,view,2998-01-01\n');
    for (const parseThread of [false, true]) {
      const db = await catalogue(`future-${parseThread}.shelf`);
      const r = await runImport(db, { target: 'signals', file, parseThread });
      expect(r).toMatchObject({ committed: true, added: 3, futureDated: 2 });
      expect(r.warnings).toEqual(["2 signals are dated after today (the latest 2999-05-01): check the file's dates; a backtest holds out the latest signals, and these would be them"]);
    }
  });
});

describe('files that are not what they seem', () => {
  const refused = async (file: string, target: 'items' | 'signals' = 'items') => {
    const db = freshWorkspace(dir, `refused-${path.basename(file)}.shelf`);
    return importFile(db, { target, file }).then(() => undefined, (e: unknown) => e as Error);
  };

  it('names UTF-16 as UTF-16, with or without a byte order mark (Unicode Standard section 23.8)', async () => {
    const text = 'id,title\nb1,Moss Lantern\n';
    const le = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
    const beNoMark = Buffer.from(text, 'utf16le').swap16();
    expect((await refused(write(dir, 'le.csv', le)))?.message).toBe('the file is UTF-16 text (little-endian, by its byte order mark); save it as UTF-8 and import again');
    expect((await refused(write(dir, 'be.csv', beNoMark)))?.message).toBe('the file is UTF-16 text (big-endian); save it as UTF-8 and import again');
    expect((await refused(write(dir, 'le.json', Buffer.from('[{"id":"b1","title":"Moss"}]', 'utf16le'))))?.message).toMatch(/^the file is UTF-16 text \(little-endian\)/);
  });

  it('names a JSON root that is not a list of records', async () => {
    expect((await refused(write(dir, 'wrapped.json', '{"items": [{"id": "b1", "title": "Moss"}], "total": 1}')))?.message).toBe(
      "the file's top level is an object (keys 'items', 'total'; if the records sit under one key, save that list alone or as JSON Lines), not a list of records: a JSON import is a list of objects [{...}, {...}]",
    );
    expect((await refused(write(dir, 'string.json', '"b1"')))?.message).toMatch(/^the file's top level is a string, not a list of records/);
  });

  it('names the record in every error of a JSON list, where a minified file has them all on line 1', async () => {
    const db = freshWorkspace(dir, 'records.shelf');
    const file = write(dir, 'minified.json', '[{"id":"b1","title":"Moss","price":"x"},{"id":"b2","title":"Jar"},{"id":"b3","title":""},7]');
    const r = await importFile(db, { target: 'items', file });
    expect(r.errors.map((e) => e.message)).toEqual([
      `${file}:1:price: record 1: price: not a number: 'x'`,
      `${file}:1:title: record 3: title: an item needs a title`,
      `${file}:1: record 4 is not a JSON object`,
    ]);
  });

  it('reports 1e999 as out of range, not as null (IEEE 754 binary64 overflows past about 1.8e308)', async () => {
    const db = freshWorkspace(dir, 'huge-number.shelf');
    const json = await importFile(db, { target: 'items', file: write(dir, 'inf.jsonl', '{"id":"b1","title":"Moss","price":1e999}\n') });
    expect(json.errors[0]?.reason).toBe('price: out of range: a number too large to hold (1e999 or the like); numbers go up to about 1.8e308');
    const csv = await importFile(db, { target: 'items', file: write(dir, 'inf.csv', 'id,title,price\nb1,Moss,1e999\n') });
    expect(csv.errors[0]?.reason).toBe("price: out of range: '1e999'; numbers go up to about 1.8e308");
  });
});
