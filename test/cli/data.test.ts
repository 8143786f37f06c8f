import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-cli-data-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const ws = path.join(dir, 'shop.sqlite');
const write = (name: string, text: string) => {
  const f = path.join(dir, name);
  fs.writeFileSync(f, text);
  return f;
};

describe('shelfwright import and stats', () => {
  it('imports a catalogue, creating the workspace, and reports what it added', async () => {
    const items = write('items.csv', 'sku,title,category,tags,price,added_at,promoted\nA1,Twine Spool,tools,garden|string,3.5,2026-01-05,no\nA2,Seed Tray,pots,,7,2026-02-01,yes\n');
    const io = capture();
    expect(await main(['import', 'items', items, '-w', ws], io, {})).toBe(0);
    expect(io.stdout.join('\n')).toMatch(/2 rows: 2 added, 0 updated, 0 unchanged, 0 rejected/);
  });

  it('reports 0 added and 2 unchanged when the same file is imported again', async () => {
    const io = capture();
    expect(await main(['import', 'items', path.join(dir, 'items.csv'), '-w', ws, '--json'], io, {})).toBe(0);
    expect(JSON.parse(io.stdout.join(''))).toMatchObject({ added: 0, updated: 0, unchanged: 2, committed: true });
  });

  it('exits 2, names file:line:column and changes nothing when a row is bad', async () => {
    const signals = write('signals.csv', 'customer,item,kind,at\nC1,A1,view,2026-03-01T10:00:00Z\nC1,A9,view,2026-03-02T10:00:00Z\n');
    const io = capture();
    expect(await main(['import', 'signals', signals, '-w', ws, '--create-customers'], io, {})).toBe(2);
    expect(io.stderr.join('\n')).toMatch(/NOT imported: nothing was changed/);
    expect(io.stderr.join('\n')).toContain(`${signals}:3:`);
    const stats = capture();
    await main(['stats', '-w', ws, '--json'], stats, {});
    expect(JSON.parse(stats.stdout.join(''))).toMatchObject({ signals: 0, customers: 0 });
  });

  it('takes FIELD=HEADER mappings and day-first dates when told', async () => {
    const signals = write('reads.csv', 'reader;product;event;when\nC1;A1;read;03/04/2026\nC2;A2;purchase;04/04/2026\n');
    const io = capture();
    const argv = ['import', 'signals', signals, '-w', ws, '--map', 'customer=reader', '--date-order', 'dmy', '--create-customers'];
    expect(await main(argv, io, {})).toBe(0);
    const stats = capture();
    await main(['stats', '-w', ws, '--json'], stats, {});
    const s = JSON.parse(stats.stdout.join(''));
    expect(s).toMatchObject({ signals: 2, customers: 2, signalsByKind: { read: 1, purchase: 1 } });
    // 03/04/2026 read day-first is 3 April 2026.
    expect(new Date(s.firstSignalAt).toISOString()).toBe('2026-04-03T00:00:00.000Z');
  });

  it('refuses a slash date without --date-order and says which flag to pass', async () => {
    const signals = write('ambiguous.csv', 'customer,item,kind,at\nC1,A1,view,03/04/2026\n');
    const io = capture();
    expect(await main(['import', 'signals', signals, '-w', ws], io, {})).toBe(2);
    expect(io.stderr.join('\n')).toMatch(/dateOrder|date-order/);
  });

  it('prints real figures with stats', async () => {
    const io = capture();
    expect(await main(['stats', '-w', ws], io, {})).toBe(0);
    const text = io.stdout.join('\n');
    expect(text).toMatch(/items\s+2 \(2 available, 1 promoted/);
    expect(text).toMatch(/signals\s+2 from 2026-04-03 to 2026-04-04/);
  });

  it('exits 1 when the target or the file is missing, or a mapping is malformed', async () => {
    for (const argv of [['import'], ['import', 'items'], ['import', 'things', 'x.csv'], ['import', 'items', 'x.csv', '--map', 'title']]) {
      const io = capture();
      expect(await main([...argv, '-w', ws], io, {})).toBe(1);
    }
  });

  it('previews the detected mapping without importing', async () => {
    const f = write('preview.csv', 'product_id,name,section\nB1,Hose Reel,irrigation\n');
    const io = capture();
    expect(await main(['import', 'items', f, '-w', ws, '--preview', '--json'], io, {})).toBe(0);
    const p = JSON.parse(io.stdout.join(''));
    expect(p.mapping).toMatchObject({ id: 'product_id' });
    expect(p.sampleRows[0]).toEqual(['B1', 'Hose Reel', 'irrigation']);
    const stats = capture();
    await main(['stats', '-w', ws, '--json'], stats, {});
    expect(JSON.parse(stats.stdout.join('')).items).toBe(2);
  });

  it('reads a mapping file given with --mapping-file, --map overriding its entries', async () => {
    const f = write('odd-headers.csv', 'ref,label,grp,section\nM1,Mulch Fork,tools,beds\n');
    const mapping = write('odd-headers.json', JSON.stringify({ id: 'ref', title: 'label', category: 'grp' }));
    const io = capture();
    expect(await main(['import', 'items', f, '-w', ws, '--mapping-file', mapping, '--map', 'category=section', '--json'], io, {})).toBe(0);
    expect(JSON.parse(io.stdout.join(''))).toMatchObject({ added: 1, mapping: { id: 'ref', title: 'label', category: 'section' } });
    const once = capture();
    expect(await main(['import', 'items', write('one.csv', 'id,title\nN1,Net Bag\n'), '-w', ws], once, {})).toBe(0);
    expect(once.stdout.join('\n')).toMatch(/ 1 row: 1 added,/);
    const bad = write('bad-mapping.json', '{"id": 3}');
    const err = capture();
    expect(await main(['import', 'items', f, '-w', ws, '--mapping-file', bad], err, {})).toBe(2);
    expect(err.stderr.join('\n')).toMatch(/mapping file/);
  });
});

describe('shelfwright import signals --kind (issue 10 item 7: files without a kind column)', () => {
  const plays = () => write('plays.csv', 'customer,item,count\nK1,A1,2\nK2,A2,1\n');
  it('gives every row of a (customer, item, count) file the kind', async () => {
    const io = capture();
    expect(await main(['import', 'signals', plays(), '--kind', 'purchase', '-w', ws, '--create-customers', '--json'], io, {})).toBe(0);
    expect(JSON.parse(io.stdout.join(''))).toMatchObject({ rows: 2, added: 2, committed: true, mapping: { value: 'count' } });
    const stats = capture();
    await main(['stats', '-w', ws, '--json'], stats, {});
    expect(JSON.parse(stats.stdout.join('')).signalsByKind).toMatchObject({ purchase: 3 }); // 1 from the mapped file above
  });

  it('exits 1 naming the flag and the valid kinds for an unknown kind, or for a target other than signals', async () => {
    const io = capture();
    expect(await main(['import', 'signals', plays(), '--kind', 'listen', '-w', ws], io, {})).toBe(1);
    expect(io.stderr.join('\n')).toContain("--kind must be one of view, basket, purchase, rating, read, click, other, got 'listen'");
    const items = capture();
    expect(await main(['import', 'items', plays(), '--kind', 'view', '-w', ws], items, {})).toBe(1);
    expect(items.stderr.join('\n')).toContain('--kind is for signals only, not items');
  });

  it('exits 2 and changes nothing when the file has a kind column too', async () => {
    const f = write('with-kind.csv', 'customer,item,kind\nK1,A1,view\n');
    const io = capture();
    expect(await main(['import', 'signals', f, '--kind', 'purchase', '-w', ws], io, {})).toBe(2);
    expect(io.stderr.join('\n')).toMatch(/the file has a kind column \('kind'\), and every row was also given the kind purchase/);
  });

  it('says so in the help', async () => {
    const io = capture();
    expect(await main(['import', '--help'], io, {})).toBe(0);
    const help = io.stdout.join('\n');
    expect(help).toMatch(/--kind KIND/);
    expect(help).toMatch(/every row is this kind \(view, basket, purchase, rating, read, click, other\), for a file without a kind column; a file with one is refused/);
  });
});

describe('shelfwright import: warnings', () => {
  it('prints the count of signals dated after today under the counts', async () => {
    const f = write('future.csv', 'customer,item,kind,at\nK1,A1,view,2999-01-01T00:00:00Z\n');
    const io = capture();
    expect(await main(['import', 'signals', f, '-w', ws], io, {})).toBe(0);
    expect(io.stdout.join('\n')).toContain('  warning: 1 signal is dated after today (the latest 2999-01-01)');
  });
});

describe('shelfwright import -w to a new path', () => {
  it('says it is creating a new workspace (a mistyped path would otherwise go unnoticed), and only then', async () => {
    const fresh = path.join(dir, 'fresh.sqlite');
    const items = write('fresh-items.csv', 'id,title\nF1,Fern Pot\n');
    const first = capture();
    expect(await main(['import', 'items', items, '-w', fresh], first, {})).toBe(0);
    expect(first.stderr).toEqual([`no workspace at ${fresh} yet: creating a new one`]);
    const again = capture();
    expect(await main(['import', 'items', items, '-w', fresh], again, {})).toBe(0);
    expect(again.stderr).toEqual([]);
  });
});
