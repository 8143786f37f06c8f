import fs from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';
import { seededCli } from './seeded-cli.ts';

describe('shelfwright edition and shelf commands', () => {
  it('says what an action changed, and refill starts the shelf over', async () => {
    const { run, json } = seededCli();
    await run('edition', 'new', 'w', '--date', '2026-03-02');
    const v0 = await json('shelf', 'add', 'w', 'Front', '--size', '4');
    const items = v0.slots.map((s: { item: string }) => s.item);
    const off = Array.from({ length: 40 }, (_, k) => `SKU-${String(k + 1).padStart(3, '0')}`).find((x) => !items.includes(x))!;
    const pinned = await run('shelf', 'pin', 'w', 'Front', off, '--slot', '1');
    expect(pinned.out).toContain(`changed:\n  + ${off}`);
    expect(pinned.out).toMatch(new RegExp(`  - ${items[3]} .* from slot 4 \\(pushed off the end of the shelf\\)`));
    expect(pinned.out).toMatch(/relevance given up against a refill: /);
    const banned = await run('shelf', 'ban', 'w', 'Front', off);
    expect(banned.out).toMatch(new RegExp(`  - ${off} .* from slot 1 \\(banned\\)`));
    const lifted = await json('shelf', 'unban', 'w', 'Front', off);
    expect(lifted.bans).toEqual([]);
    expect(lifted.actions.at(-1).summary).toMatch(/^Lifted the ban on /);
    const refilled = await run('shelf', 'refill', 'w', 'Front');
    expect(refilled.code).toBe(0);
    expect(refilled.out).toMatch(/changed:/);
  });

  it('takes a taste group by name or number in --audience, and says what it expects otherwise', async () => {
    const { run } = seededCli();
    await run('edition', 'new', 'w', '--date', '2026-03-02');
    // No trained model here: the named group is parsed and reaches the service, which asks for a training.
    const named = await run('shelf', 'add', 'w', 'Lanterns', '--size', '4', '--audience', 'group:Lantern people');
    expect(named.code).not.toBe(0);
    expect(named.err).toMatch(/train the models first/);
    const bad = await run('shelf', 'add', 'w', 'Lanterns', '--size', '4', '--audience', 'group: ');
    expect(bad.code).not.toBe(0);
    expect(bad.err).toMatch(/--audience expects everyone, group:N, group:NAME or bought:CATEGORY\[:DAYS\], got 'group: '/);
  });

  it('walks an edition from shelves to publish, rest period, compare and export', async () => {
    const { file: w, run, json } = seededCli();

    expect((await run('edition', 'new', 'week 10', '--date', '2026-03-02')).code).toBe(0);
    for (const [label, size] of [['Front', '6'], ['Gifts', '4'], ['Newsletter', '5']] as const) {
      const r = await run('shelf', 'add', 'week 10', label, '--size', size, '--rest', '1');
      expect(r.code).toBe(0);
      expect(r.out).toMatch(new RegExp(`week 10 / ${label}`));
      expect(r.out).toMatch(/^Variety +\d\.\d\d +0–1 /m);
    }

    const pinned = await json('shelf', 'pin', 'week 10', 'Front', 'SKU-012', '--slot', '1', '--reason', 'launch week');
    expect(pinned.slots[0]).toMatchObject({ slot: 1, item: 'SKU-012', pinned: true });
    expect(pinned.actions.at(-1)).toMatchObject({ kind: 'pin', reason: 'launch week' });

    const victim = pinned.slots[1].item as string;
    const banned = await json('shelf', 'ban', 'week 10', 'Front', victim);
    expect(banned.slots.map((s: { item: string }) => s.item)).not.toContain(victim);

    const boosted = await json('shelf', 'boost', 'week 10', 'Front', 'SKU-039', '--factor', '50');
    expect(boosted.slots.map((s: { item: string }) => s.item)).toContain('SKU-039');

    const quota = await json('shelf', 'brief', 'week 10', 'Front', '--quota', 'category:2', '--promoted-max', '0.2');
    expect(quota.brief.rules.quotas).toEqual([{ facet: 'category', max: 2 }]);
    const cats = new Map<string, number>();
    for (const s of quota.slots) cats.set(s.category, (cats.get(s.category) ?? 0) + 1);
    const promoted = quota.slots.filter((s: { promoted: boolean }) => s.promoted).length;
    // 6 slots over 4 categories with plenty of candidates: both rules can be met, so they are, with no
    // violation (a cap of 0.2 × 6 slots allows floor(1.2) = 1 sponsored item).
    expect(Math.max(...cats.values())).toBeLessThanOrEqual(2);
    expect(promoted).toBeLessThanOrEqual(1);
    expect(quota.violations).toEqual([]);

    const meter = await run('shelf', 'meter', 'week 10', 'Front');
    expect(meter.code).toBe(0);
    expect(meter.out).toMatch(/^Sponsored slots +\d+% +0–100% +target 20% or less/m);
    // The price of the editor's choices, in words (the pin of a low-ranked item in slot 1 costs something).
    expect(meter.out).toMatch(/^These choices cost \d+% of predicted relevance against the most relevant list for this audience\.$/m);
    // A shelf added without weights had its dials set for its brief, and the meter says so (issue 10 item 4).
    expect(meter.out).toMatch(/^The dials \(popularity [\d.]+, trend [\d.]+, freshness [\d.]+\) were set for this brief so they cost at most 5% of predicted relevance\.$/m);

    const undone = await json('shelf', 'undo', 'week 10', 'Front');
    expect(undone.canRedo).toBe(true);
    const redone = await json('shelf', 'redo', 'week 10', 'Front');
    // The brief change is an editorial action (issue 12): undo takes it back with its list, redo restores it.
    expect(undone.actions.at(-1)).toMatchObject({ kind: 'brief', undone: true });
    expect(undone.brief.rules.quotas).toEqual([]);
    expect(undone.slots).toEqual(boosted.slots);
    expect(redone.slots).toEqual(quota.slots);
    expect(redone.canRedo).toBe(false);

    const before = await json('edition', 'show', 'week 10');
    const published = await json('edition', 'publish', 'week 10', '--yes');
    expect(published).toMatchObject({ edition: 'week 10', shelves: 3 });
    const again = await run('shelf', 'pin', 'week 10', 'Front', 'SKU-001', '--slot', '2');
    expect(again.code).toBe(2);
    expect(again.err).toMatch(/published and read-only/);

    const next = await json('edition', 'new', 'week 11', '--date', '2026-03-09', '--from', 'week 10');
    expect(next.shelves.map((s: { label: string }) => s.label)).toEqual(['Front', 'Gifts', 'Newsletter']);
    const ran = new Set<string>(before.shelves.flatMap((s: { slots: { item: string }[] }) => s.slots.map((x) => x.item)));
    for (const s of next.shelves) {
      for (const x of s.slots) expect(ran.has(x.item)).toBe(false);
      expect(s.excluded.resting).toBeGreaterThan(0);
    }
    expect((await run('shelf', 'meter', 'week 11', 'Front')).out).toMatch(/left out of the pool: .*\d+ resting \(rest period\)/);

    const cmp = await json('edition', 'compare', 'week 10', 'week 11');
    expect(cmp.shelves[0].label).toBe('Front');
    expect(cmp.shelves[0].removed.sort()).toEqual(before.shelves[0].slots.map((s: { item: string }) => s.item).sort());
    const cmpText = (await run('edition', 'compare', 'week 10', 'week 11')).out;
    expect(cmpText).toMatch(/Front\n {2}added: {3}SKU-/);
    // Every changed item is printed by its id, exactly the ids the JSON answer holds (never a '({id})' template).
    const cmpJson = await json('edition', 'compare', 'week 10', 'week 11'); // fresh: the check above sorted its lists in place
    for (const s of cmpJson.shelves as { label: string; added: string[]; removed: string[] }[]) {
      const block = cmpText.split(/\n(?=\S)/).find((b) => b.startsWith(s.label))!;
      expect(block).toContain(`  added:   ${s.added.join(', ') || '–'}`);
      expect(block).toContain(`  removed: ${s.removed.join(', ') || '–'}`);
    }
    expect(cmpText).not.toContain('{id}');

    const csv = await run('edition', 'export', 'week 10', '--format', 'csv');
    // One table (csv-parse, strict column count): the header and 15 slots; the notes come on stderr.
    const rows = parse(csv.out) as string[][];
    expect(rows[0]![8]).toBe('sponsored');
    expect(rows.length).toBe(1 + 15);
    // Each filled slot carries its rank in the pool it was filled from, frozen at publish.
    expect(rows[0]![11]).toBe('rank');
    for (const r of rows.slice(1)) if (r[4] !== '') expect(r[11]).toMatch(/^[1-9]\d*$/);
    expect(csv.err).toMatch(/differ by country/);
    const csvOut = path.join(path.dirname(w), 'week10.csv');
    expect((await run('edition', 'export', 'week 10', '--format', 'csv', '--out', csvOut)).out).toBe(`wrote ${csvOut} and ${path.join(path.dirname(w), 'week10.notes.txt')}`);
    expect(fs.readFileSync(path.join(path.dirname(w), 'week10.notes.txt'), 'utf8')).toMatch(/^ {2}sponsored: "Sponsored" for a promoted/m);
    const sponsoredRows = rows.filter((r) => r[8] === 'Sponsored').length;
    expect(sponsoredRows).toBe(before.shelves.flatMap((s: { slots: { promoted: boolean }[] }) => s.slots).filter((x: { promoted: boolean }) => x.promoted).length);
    const doc = JSON.parse((await run('edition', 'export', 'week 10', '--format', 'json')).out);
    expect(doc.shelves).toHaveLength(3);
    const out = path.join(path.dirname(w), 'week10.html');
    expect((await run('edition', 'export', 'week 10', '--format', 'html', '--out', out)).code).toBe(0);
    const html = fs.readFileSync(out, 'utf8');
    expect(html).not.toMatch(/<script|(src|href)=["']?https?:/i);
    expect(html).toMatch(/differ by country/);

    const list = await json('edition', 'list');
    expect(list.editions.map((e: { label: string; status: string }) => [e.label, e.status])).toEqual([
      ['week 10', 'published'],
      ['week 11', 'draft'],
    ]);
  });

  it('exits 1 on a usage error and 2 on a data error, and has --help with an example', async () => {
    const { file: w } = seededCli();
    const io = capture();
    expect(await main(['shelf', 'pin', 'x', 'y', 'SKU-001', '-w', w], io, {})).toBe(1);
    expect(io.stderr.join('\n')).toMatch(/give --slot N/);
    const io2 = capture();
    expect(await main(['edition', 'show', 'nope', '-w', w], io2, {})).toBe(2);
    expect(io2.stderr.join('\n')).toMatch(/no edition called 'nope'/);
    const io3 = capture();
    expect(await main(['shelf', 'add', '--help'], io3, {})).toBe(0);
    expect(io3.stdout.join('\n')).toMatch(/example:\n {2}shelfwright shelf add/);
    const io4 = capture();
    expect(await main(['forget', 'C-3', '-w', w], io4, {})).toBe(0);
    expect(io4.stdout.join('\n')).toMatch(/erased customer C-3: \d+ signals/);
  });
});
