import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemoShop } from '../../demo-data/generator/index.ts';
import { importFile } from '../../src-main/services/import.ts';
import { workspaceCli } from './capture.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { tempDir } from '../holdout/fixture.ts';

/**
 * The model commands end to end on a small generated shop: every 10th signal line is held out into a
 * separate file (pairs removed from the workspace), the rest imported; then train, evaluate (split and
 * holdout), similar, propose and recommend through main(), as a terminal would run them.
 */
let dir: string;
let ws: string;
let holdout: string;
let firstItem: string;

const { run, json } = workspaceCli(() => ws);

beforeAll(async () => {
  dir = tempDir('cli-models');
  const shop = await generateDemoShop({ seed: 3, items: 120, customers: 400, signals: 8000, outDir: dir });
  const lines = fs.readFileSync(shop.files.signals, 'utf8').trim().split('\n');
  const kept = [lines[0]!];
  const held = [lines[0]!];
  lines.slice(1).forEach((l, q) => (q % 10 === 9 ? held : kept).push(l));
  fs.writeFileSync(shop.files.signals, kept.join('\n'));
  holdout = path.join(dir, 'holdout.csv');
  fs.writeFileSync(holdout, [...held, 'nobody-at-all,' + held[1]!.split(',').slice(1).join(',')].join('\n'));
  ws = path.join(dir, 'w.sqlite');
  const db = openWorkspace(ws);
  for (const target of ['items', 'customers', 'signals'] as const) await importFile(db, { target, file: shop.files[target] });
  firstItem = (db.prepare('SELECT external_id FROM item ORDER BY id LIMIT 1').pluck().get() as string);
  db.close();
}, 30_000);
afterAll(() => {
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('shelfwright train / evaluate / similar / propose / recommend', () => {
  it('train prints progress lines on a non-terminal stderr and a per-model summary', async () => {
    const r = await run('train', '--factors', '8', '--iterations', '3', '--threads', '2');
    expect(r.code, r.err).toBe(0);
    expect(r.err).toMatch(/^ *\d+% (load|matrix|fit)/m);
    expect(r.err).toMatch(/100% done/);
    expect(r.err.split('\n').length).toBeGreaterThanOrEqual(3);
    for (const kind of ['content', 'itemknn', 'ials', 'ease', 'popularity']) expect(r.out).toMatch(new RegExp(`^${kind}\\b`, 'm'));
    expect(r.out).toMatch(/final loss/);
    // Signal values reach iALS through the chosen confidence scaling (Hu, Koren & Volinsky 2008, eq. 2 and §4).
    const list = await json('train', '--models', 'ials', '--factors', '8', '--iterations', '2', '--scaling', 'log', '--alpha', '10');
    expect(list.job.state).toBe('done');
    const ials = list.models.find((m: { kind: string }) => m.kind === 'ials');
    expect(ials.iterations).toBe(2);
    expect(ials.params).toMatchObject({ scaling: 'log', alpha: 10, factors: 8 });
    expect((await run('train', '--scaling', 'square')).code).toBe(1);
  }, 30_000);

  it('evaluate prints the table of models against baselines, and --json gives the rows', async () => {
    const text = await run('evaluate', '--k', '5', '--sample', '150');
    expect(text.code, text.err).toBe(0);
    expect(text.out).toMatch(/Recall@5 +Precision@5 +NDCG@5 +MAP@5 +HitRate@5 +coverage +novelty/);
    const e = await json('evaluate', '--k', '5', '--sample', '150');
    expect(e.rows.map((r: { model: string }) => r.model)).toEqual(expect.arrayContaining(['hybrid', 'popularity', 'random', 'ials']));
    const models = (await run('info')).code;
    expect(models).toBe(0);
  }, 30_000);

  it('models and evaluate say which hybrid: the blend, or the single model it is, with the validation figures', async () => {
    const list = await json('models');
    const h = list.hybrid;
    expect(h).not.toBeNull();
    // Never worse than its best part on validation (issue 10 item 3).
    const best = Math.max(...h.validation.singles.map((x: { ndcg: number }) => x.ndcg));
    expect(h.validation.ndcg).toBeGreaterThanOrEqual(best);
    if (h.kind === 'single') {
      expect(h.reason).toMatch(
        new RegExp(`^(no blend beat ${h.model} on validation.*, so the hybrid is ${h.model}|the blend cannot be validated|.* beat ${h.model} on the earlier validation window .*, so the hybrid is ${h.model})`),
      );
    } else expect(h.reason).toMatch(/ on validation against \d\.\d{4} for \w+ alone(; on a later window \d\.\d{4} against \d\.\d{4})?$/);
    const text = await run('models');
    expect(text.code, text.err).toBe(0);
    expect(text.out).toContain(`hybrid: ${h.reason}`);
    expect(text.out).toMatch(/NDCG@10 alone: content \d/);
    const ev = await run('evaluate', '--k', '5', '--sample', '150');
    expect(ev.out).toMatch(/^hybrid: (no blend beat|the blend cannot be validated|\d)/m);
  }, 60_000);

  it('evaluate --holdout scores every model on the file and reports the unknown customer', async () => {
    const r = await json('evaluate', '--holdout', holdout, '--k', '10');
    expect(r.k).toBe(10);
    expect(r.unknownCustomers.distinct).toBe(1);
    expect(r.unknownCustomers.examples).toEqual(['nobody-at-all']);
    expect(r.models.map((m: { model: string }) => m.model).sort()).toEqual(['content', 'ease', 'hybrid', 'ials', 'itemknn', 'popularity', 'random']);
    const get = (name: string) => r.models.find((m: { model: string }) => m.model === name);
    expect(get('hybrid').ndcg).toBeGreaterThan(get('random').ndcg);
    // Every usable row is a truth pair, a repeat of a pair, or a pair the customer already has: none vanish.
    expect(r.pairs + r.duplicateRows + r.alreadyInWorkspace).toBe(r.usableRows);
    expect(r.usableRows + r.unknownCustomers.rows).toBe(r.rows);
    expect(r.customers).toBeGreaterThan(50);
    const text = await run('evaluate', '--holdout', holdout);
    expect(text.out).toMatch(/1 unknown customer \(1 row\), e\.g\. nobody-at-all/);
    expect(text.out).toMatch(/NDCG@20/);
  }, 30_000);

  it('evaluate refuses flags of the other mode: --sample with --holdout, holdout-file flags without it', async () => {
    const cases: [string[], RegExp][] = [
      [['--holdout', holdout, '--sample', '100'], /--sample only works without --holdout/],
      [['--map', 'customer=User'], /--map only works with --holdout FILE/],
      [['--format', 'csv'], /--format only works with --holdout FILE/],
      [['--delimiter', ';'], /--delimiter only works with --holdout FILE/],
      [['--date-order', 'dmy'], /--date-order only works with --holdout FILE/],
      [['--holdout', holdout, '--date-order', 'ymd'], /--date-order must be dmy or mdy/],
    ];
    for (const [flags, message] of cases) {
      const r = await run('evaluate', ...flags);
      expect(r.code, flags.join(' ')).toBe(1);
      expect(r.err, flags.join(' ')).toMatch(message);
      expect(r.err).toMatch(/Run 'shelfwright evaluate --help'/);
    }
    const help = await run('evaluate', '--help');
    expect(help.out).toMatch(/--holdout FILE .*\[--delimiter C\] \[--date-order dmy\|mdy\]/);
    expect(help.out).toMatch(/--date-order .*dmy or mdy/);
  });

  it('evaluate --holdout --date-order reads day/month dates in the holdout file', async () => {
    // The held-out pairs (customer, item) with slash dates: 25/04/2026 is only a date read day-first.
    const pairs = fs.readFileSync(holdout, 'utf8').trim().split('\n').slice(1).map((l) => l.split(',').slice(0, 2));
    const file = path.join(dir, 'dated.csv');
    fs.writeFileSync(file, ['customer;item;at', ...pairs.map(([c, i], q) => `${c};${i};${q % 2 ? '25/04/2026' : '03/04/2026'}`)].join('\n'));
    const ambiguous = await run('evaluate', '--holdout', file, '--delimiter', ';');
    expect(ambiguous.code).toBe(2);
    expect(ambiguous.err).toMatch(/ambiguous date/);
    const r = await json('evaluate', '--holdout', file, '--delimiter', ';', '--date-order', 'dmy');
    expect(r.rows).toBe(pairs.length);
    expect(r.unknownCustomers.examples).toEqual(['nobody-at-all']);
    expect(r.pairs).toBeGreaterThan(0);
    // Month-first, 25/04/2026 has no month 25: the order really reaches the reader.
    const mdy = await run('evaluate', '--holdout', file, '--delimiter', ';', '--date-order', 'mdy');
    expect(mdy.code).toBe(2);
    expect(mdy.err).toMatch(/25\/04\/2026/);
  }, 30_000);

  it('similar explains each neighbour; unknown items are data errors, a missing one a usage error', async () => {
    const r = await json('similar', firstItem, '--n', '5');
    expect(r.neighbours).toHaveLength(5);
    for (const n of r.neighbours) expect(['content', 'collaborative']).toContain(n.mainReason);
    expect((await run('similar', 'no-such-item')).code).toBe(2);
    expect((await run('similar')).code).toBe(1);
  });

  it('propose ranks a pool for flags with percentiles and contributions', async () => {
    const r = await json('propose', '--anchor', firstItem, '--n', '5', '--date', '2026-06-01');
    expect(r.items).toHaveLength(5);
    expect(r.date).toBe('2026-06-01');
    expect(r.items.map((x: { item: string }) => x.item)).not.toContain(firstItem);
    expect((await run('propose', '--date', 'June')).code).toBe(2);
    expect((await run('propose', '--n', 'many')).code).toBe(1);
  });

  it('recommend writes identical files on two runs and refuses a half-given command line', async () => {
    const a = path.join(dir, 'a.csv');
    const b = path.join(dir, 'b.csv');
    expect((await run('recommend', '--all', '--top', '3', '--out', a)).code).toBe(0);
    expect((await run('recommend', '--all', '--top', '3', '--out', b)).code).toBe(0);
    expect(fs.readFileSync(a, 'utf8')).toBe(fs.readFileSync(b, 'utf8'));
    expect(fs.readFileSync(a, 'utf8').trim().split('\r\n')).toHaveLength(1 + 400 * 3);
    // No customer is offered an item they already have (any signal of any kind in the workspace).
    const db = openWorkspace(ws, { readonly: true });
    const owned = new Set(
      (db.prepare('SELECT c.external_id AS c, i.external_id AS i FROM signal s JOIN customer c ON c.id = s.customer_id JOIN item i ON i.id = s.item_id').all() as { c: string; i: string }[]).map((r) => `${r.c}|${r.i}`),
    );
    db.close();
    const rows = fs.readFileSync(a, 'utf8').trim().split('\r\n').slice(1).map((l) => l.split(','));
    expect(rows.filter(([c, , i]) => owned.has(`${c}|${i}`))).toEqual([]);
    const list = path.join(dir, 'who.txt');
    fs.writeFileSync(list, 'ghost\n');
    const r = await json('recommend', '--customers', list, '--top', '2', '--out', path.join(dir, 'c.jsonl'));
    expect(r.unknownCustomers.distinct).toBe(1);
    expect((await run('recommend', '--top', '3', '--out', a)).code).toBe(1);
    expect((await run('recommend', '--all', '--out', a)).code).toBe(1);
  });
});
