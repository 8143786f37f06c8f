import { describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';
import { handWorkspaceForFile } from '../holdout/fixture.ts';

/**
 * The tuner's notes reach `shelfwright models`: each under the model it is about, in the text and in --json
 * (`tuningNotes`), carried over while a tuning's settings are trained again on unchanged data, and gone once
 * a model is trained untuned. The note checked is the search's own (its iALS trials run fewer sweeps than the
 * training: grid.ts IALS_SEARCH_ITERATIONS), so it appears exactly when training asks for more sweeps than that.
 */
const hand = handWorkspaceForFile('cli-tuning-notes');

async function run(...argv: string[]) {
  const io = capture();
  const code = await main([...argv, '-w', hand.file()], io, {});
  return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
}

type Listed = { kind: string; tuning: unknown; tuningNotes: string[] };
const listed = async (): Promise<Listed[]> => JSON.parse((await run('models', '--json')).out).models;

describe('shelfwright train and models show the tuner notes', () => {
  it('lists each tuned model with its notes under the table, keeps them on a reused tuning, drops them untuned', async () => {
    const trained = await run('train', '--iterations', '6', '--threads', '1');
    expect(trained.code, trained.err).toBe(0);
    expect(trained.out.split('\n')[0]).toMatch(/^tuned /);
    const note = 'iALS trials ran 3 of the 6 training sweeps each (a cheaper fit to rank settings)';
    // `train` itself says them too, after what was searched.
    expect(trained.out).toMatch(/^searched:\n(.+\n)+tuning notes:\n/m);
    expect(trained.out.split('\n')).toContain(`  ials: ${note}`);

    const text = await run('models');
    expect(text.code, text.err).toBe(0);
    expect(text.out).toMatch(/^model +trained \(UTC\) +seconds +status +NDCG \(evaluate\) +tuned +recency half-life$/m);
    // The tuned cell: the grid's best and its validation NDCG; content has no grid.
    expect(text.out).toMatch(/^ials +.* factors=\d+ .*\(NDCG@10 [\d.–]+\) +\S+$/m);
    expect(text.out).toMatch(/^content +.* – +off$/m);
    expect(text.out).toMatch(/^tuning notes:$/m);
    expect(text.out.split('\n')).toContain(`  ials: ${note}`);
    const first = await listed();
    expect(first.find((m) => m.kind === 'ials')!.tuningNotes).toContain(note);
    expect(first.find((m) => m.kind === 'content')!.tuningNotes).toEqual([]);

    // Unchanged data: the last tuning's settings train again, and its notes still say how they were chosen.
    const again = await run('train', '--iterations', '6', '--threads', '1');
    expect(again.out.split('\n')[0]).toMatch(/^not tuned: the data is unchanged/);
    expect((await listed()).find((m) => m.kind === 'ials')!.tuningNotes).toContain(note);

    // Untuned training: no tuning, so no notes of one.
    expect((await run('train', '--no-tune', '--iterations', '2', '--threads', '1')).code).toBe(0);
    const untuned = await listed();
    expect(untuned.every((m) => m.tuning === null && m.tuningNotes.length === 0)).toBe(true);
    expect((await run('models')).out).not.toContain('tuning notes:');
  }, 120_000);
});
