import { describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';
import { seededCli } from './seeded-cli.ts';

interface Slot {
  item: string | null;
  category: string | null;
  supplier: string | null;
}
interface Quota {
  facet: string;
  max: number;
  value?: string;
}

/** A seeded workspace (40 items, 4 categories, 5 suppliers) with a draft edition and a four-slot shelf. */
async function setUp() {
  const { run, json: anyJson } = seededCli('quotas.sqlite');
  const json = (...argv: string[]) => anyJson<{ brief: { rules: { quotas: Quota[] } }; slots: Slot[]; violations: unknown[] }>(...argv);
  expect((await run('edition', 'new', 'week 10', '--date', '2026-03-02')).code).toBe(0);
  expect((await run('shelf', 'add', 'week 10', 'Front', '--size', '4')).code).toBe(0);
  return { run, json };
}

const perCategory = (slots: Slot[]) => {
  const n = new Map<string, number>();
  for (const s of slots) if (s.category) n.set(s.category, (n.get(s.category) ?? 0) + 1);
  return Math.max(0, ...n.values());
};

describe('shelf brief: taking quotas off', () => {
  it('--drop-quota removes one quota, keeps the others and fills the shelf again', async () => {
    const { json } = await setUp();
    const open = await json('shelf', 'meter', 'week 10', 'Front');
    // Without quotas the taste signals put two items of one category on the shelf.
    expect(perCategory(open.slots)).toBeGreaterThan(1);

    // Four slots, four categories: one of each is possible, so the cap holds with no violation. The other two
    // quotas cannot bind on this shelf (no Mossgate item is proposed; four items of a tag fit four slots).
    const capped = await json('shelf', 'brief', 'week 10', 'Front', '--quota', 'category:1', '--quota', 'supplier:2:Mossgate', '--quota', 'tag:4');
    expect(capped.brief.rules.quotas).toHaveLength(3);
    expect(perCategory(capped.slots)).toBe(1);
    expect(capped.violations).toEqual([]);
    expect(capped.slots).not.toEqual(open.slots);

    const dropped = await json('shelf', 'brief', 'week 10', 'Front', '--drop-quota', 'category');
    expect(dropped.brief.rules.quotas).toEqual([
      { facet: 'supplier', max: 2, value: 'Mossgate' },
      { facet: 'tag', max: 4 },
    ]);
    // A brief edit keeps the list where the new brief allows (issue 12): the capped list still fits, so it
    // stays; a refill then starts over under the quotas left, which do not bind: the list before any quota.
    expect(dropped.slots).toEqual(capped.slots);
    const refilled = await json('shelf', 'refill', 'week 10', 'Front');
    expect(refilled.slots).toEqual(open.slots);
    expect(perCategory(refilled.slots)).toBeGreaterThan(1);
    expect((await json('shelf', 'meter', 'week 10', 'Front')).brief.rules.quotas).toEqual(dropped.brief.rules.quotas);

    // A quota naming a value is dropped by FACET:VALUE, and a drop comes before an added --quota.
    const swapped = await json('shelf', 'brief', 'week 10', 'Front', '--drop-quota', 'supplier:Mossgate', '--drop-quota', 'tag', '--quota', 'tag:3');
    expect(swapped.brief.rules.quotas).toEqual([{ facet: 'tag', max: 3 }]);
  });

  it('--no-quotas clears every quota, and --quota after it starts afresh', async () => {
    const { json, run } = await setUp();
    const open = await json('shelf', 'meter', 'week 10', 'Front');
    await json('shelf', 'brief', 'week 10', 'Front', '--quota', 'category:1', '--quota', 'supplier:1');
    const cleared = await json('shelf', 'brief', 'week 10', 'Front', '--no-quotas');
    expect(cleared.brief.rules.quotas).toEqual([]);
    // Same brief as before any quota: a refill gives the same fill (the edit itself keeps the list).
    expect((await json('shelf', 'refill', 'week 10', 'Front')).slots).toEqual(open.slots);

    await json('shelf', 'brief', 'week 10', 'Front', '--quota', 'category:1', '--quota', 'supplier:1');
    const fresh = await json('shelf', 'brief', 'week 10', 'Front', '--no-quotas', '--quota', 'category:2');
    expect(fresh.brief.rules.quotas).toEqual([{ facet: 'category', max: 2 }]);

    const both = await run('shelf', 'brief', 'week 10', 'Front', '--no-quotas', '--drop-quota', 'category');
    expect(both.code).toBe(1);
    expect(both.err).toMatch(/--no-quotas already removes every quota/);
  });

  it('dropping a quota the brief does not have exits 1, lists the quotas it has and changes nothing', async () => {
    const { json, run } = await setUp();
    const none = await run('shelf', 'brief', 'week 10', 'Front', '--drop-quota', 'category');
    expect(none.code).toBe(1);
    expect(none.err).toMatch(/--drop-quota 'category': no such quota on the brief; it has no quotas/);

    const before = await json('shelf', 'brief', 'week 10', 'Front', '--quota', 'category:2', '--quota', 'supplier:1:Mossgate');
    const missing = await run('shelf', 'brief', 'week 10', 'Front', '--drop-quota', 'supplier', '--drop-quota', 'category', '--size', '3');
    expect(missing.code).toBe(1);
    expect(missing.out).toBe('');
    expect(missing.err).toMatch(/--drop-quota 'supplier': no such quota on the brief; its quotas are category \(max 2\), supplier:Mossgate \(max 1\)/);
    const after = await json('shelf', 'meter', 'week 10', 'Front');
    expect(after.brief).toEqual(before.brief);
    expect(after.slots).toEqual(before.slots);

    const bad = await run('shelf', 'brief', 'week 10', 'Front', '--drop-quota', 'colour:red');
    expect(bad.code).toBe(1);
    expect(bad.err).toMatch(/--drop-quota expects FACET\[:VALUE\]/);

    // With --json the usage error is a JSON object on stdout, naming the quotas too.
    const asJson = await run('shelf', 'brief', 'week 10', 'Front', '--drop-quota', 'tag', '--json');
    expect(asJson.code).toBe(1);
    expect(JSON.parse(asJson.out)).toMatchObject({ error: { exit: 1, kind: 'usage', message: expect.stringMatching(/category \(max 2\), supplier:Mossgate \(max 1\)/) } });
  });

  it('--help describes the new flags', async () => {
    const io = capture();
    expect(await main(['shelf', 'brief', '--help'], io, {})).toBe(0);
    const text = io.stdout.join('\n');
    expect(text).toMatch(/--drop-quota VALUE\s+repeatable: FACET\[:VALUE\]/);
    expect(text).toMatch(/--no-quotas\s+remove every quota/);
  });
});
