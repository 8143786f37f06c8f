import { describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { seededCli } from './seeded-cli.ts';

/**
 * A brief is parsed once, by the api contract (ApiBriefRequest, built on core's BriefRequestSchema); the command
 * line sends its brief through that same contract. So a bad brief is refused with the same words both ways in,
 * and nothing is added.
 */
describe('a bad brief', () => {
  // What is bad, the brief, and the words (with the field's name) the editor reads.
  const bad: [string, Record<string, unknown>, string][] = [
    ['a size of 0', { size: 0 }, 'Slots (size): must be at least 1'],
    ['a lambda above 1', { size: 4, lambda: 2 }, '(lambda): must be at most 1'],
    ['a field no brief has', { size: 4, colour: 'red' }, 'Unrecognized key: "colour"'],
    ['a quota on an unknown facet', { size: 4, rules: { quotas: [{ facet: 'colour', max: 1 }] } }, '(facet): must be one of category, supplier, tag'],
  ];
  it.each(bad)('with %s gets the same error through the api and the CLI, and adds no shelf', async (_what, brief, words) => {
    const { file, run, json } = seededCli('bad-brief.sqlite');
    expect((await run('edition', 'new', 'week 10', '--date', '2026-03-02')).code).toBe(0);

    const ctx = new AppContext();
    expect((await invoke(createHandlerTable(ctx), 'workspace.open', { file })).ok).toBe(true);
    const api = await invoke(createHandlerTable(ctx), 'shelf.add', { edition: 'week 10', label: 'Front', brief });
    ctx.close();
    expect(api.ok).toBe(false);
    if (api.ok) return;
    expect(api.error.code).toBe('input');
    expect(api.error.message).toContain(words);

    const cli = await run('shelf', 'add', 'week 10', 'Front', '--brief', JSON.stringify(brief));
    expect(cli.code).not.toBe(0);
    // The same words, after the flag that gave the brief (--brief, with the JSON when short enough to read)
    // where the api names its field (`brief`).
    expect(cli.err).toMatch(/^shelfwright shelf add: --brief( '[^\n]*')?: /);
    expect(cli.err).toContain(`: ${api.error.message.replace(/^brief: /, '')}`);

    const shown = await json('edition', 'show', 'week 10');
    expect(shown.shelves).toEqual([]);
  });
});
