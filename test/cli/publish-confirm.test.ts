/**
 * `edition publish` asks before freezing an edition, as the app does (issue 12 item 6): it lists the rules
 * not met and the shelves never worked on, then needs --yes, or y at a terminal; otherwise nothing changes.
 * Exit 1 for a command line missing its confirmation follows the command line's usage-error code
 * (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';
import { seededCli } from './seeded-cli.ts';

describe('edition publish asks first', () => {
  it('refuses without --yes when no one can answer, names the flag, and publishes nothing', async () => {
    const { run, json } = seededCli();
    await run('edition', 'new', 'w', '--date', '2026-03-02');
    await run('shelf', 'add', 'w', 'Front', '--size', '4');
    const r = await run('edition', 'publish', 'w');
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/publishing 'w' cannot be undone: add --yes to publish/);
    expect((await json('edition', 'show', 'w')).status).toBe('draft');
  });

  it('lists unmet rules in words and shelves never worked on, then asks y/N at a terminal', async () => {
    const { file, run, json } = seededCli();
    await run('edition', 'new', 'w', '--date', '2026-03-02');
    // Only two kites are promoted (SKU-020, SKU-040): all 4 slots sponsored cannot be met.
    await run('shelf', 'add', 'w', 'Front', '--size', '4', '--brief', JSON.stringify({ size: 4, rules: { promoted: { minCount: 1 } }, include: { categories: ['kites'] } }));
    await run('shelf', 'add', 'w', 'Side', '--size', '4');
    await run('shelf', 'boost', 'w', 'Side', 'SKU-001', '--factor', '2');
    const asked: string[] = [];
    const terminal = (answer: string) => {
      const io = capture();
      return { io, withAsk: { ...io, ask: async (q: string) => (asked.push(q), answer) } };
    };
    const no = terminal('n');
    expect(await main(['edition', 'publish', 'w', '-w', file], no.withAsk, {})).toBe(0);
    const said = no.io.stdout.join('\n');
    expect(said).toMatch(/^1 rule is not met:\n {2}Front — At least 4 sponsored items \(minCount\): /m);
    expect(said).not.toMatch(/promoted\.minCount/);
    expect(said).toContain('One shelf was never opened (no action on it): Front');
    expect(said).toContain("not published: 'w' is still a draft");
    expect(asked).toEqual(["Publish 'w' now? It cannot be undone. [y/N] "]);
    expect((await json('edition', 'show', 'w')).status).toBe('draft');

    const yes = terminal('y');
    expect(await main(['edition', 'publish', 'w', '-w', file], yes.withAsk, {})).toBe(0);
    expect(yes.io.stdout.at(-1)).toMatch(/^published 'w': 2 shelves, \d+ items$/);
    expect((await json('edition', 'show', 'w')).status).toBe('published');
  });

  it('with --yes and --json gives one JSON document holding the check', async () => {
    const { run, json } = seededCli();
    await run('edition', 'new', 'w', '--date', '2026-03-02');
    await run('shelf', 'add', 'w', 'Front', '--size', '4');
    const r = await json('edition', 'publish', 'w', '--yes');
    expect(r).toMatchObject({ edition: 'w', shelves: 1, unmet: [], unopened: ['Front'] });
  });
});

describe('shelf ban --scope on the command line', () => {
  it('takes later and until:DATE, says the reach, and refuses anything else as a usage error', async () => {
    const { run } = seededCli();
    await run('edition', 'new', 'w', '--date', '2026-03-02');
    await run('shelf', 'add', 'w', 'Front', '--size', '4');
    const later = await run('shelf', 'ban', 'w', 'Front', '--category', 'kites', '--scope', 'later');
    expect(later.code).toBe(0);
    expect(later.out).toMatch(/^banned here: category kites \(this edition and later\)$/m);
    const until = await run('shelf', 'ban', 'w', 'Front', '--tag', 'gift', '--scope', 'until:2026-03-30');
    expect(until.out).toMatch(/^banned here: category kites \(this edition and later\), tag gift \(this edition and later, until 2026-03-30\)$/m);
    const bad = await run('shelf', 'ban', 'w', 'Front', '--tag', 'small', '--scope', 'next week');
    expect(bad.code).toBe(1);
    expect(bad.err).toMatch(/--scope must be shelf, edition, later, always or until:YYYY-MM-DD, got 'next week'/);
    const early = await run('shelf', 'ban', 'w', 'Front', '--tag', 'small', '--scope', 'until:2026-03-01');
    expect(early.code).toBe(2);
    expect(early.err).toMatch(/2026-03-01 is before this edition's date 2026-03-02/);
    const lifted = await run('shelf', 'unban', 'w', 'Front', '--category', 'kites');
    expect(lifted.code).toBe(0);
    expect(lifted.out).toMatch(/^banned here: tag gift \(this edition and later, until 2026-03-30\)$/m);
  });
});
