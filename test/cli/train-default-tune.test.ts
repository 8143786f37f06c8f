import { describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { dataFingerprint, ModelRepo } from '../../src-main/store/models.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { capture } from './capture.ts';
import { handWorkspaceForFile } from '../holdout/fixture.ts';

/**
 * `train` is good by default (issue 10 item 5): with no flags it tunes when the data changed since the last
 * tuning (judged by the workspace's data fingerprint) and trains that tuning's settings again when it did not;
 * --tune always tunes, --no-tune never does, --budget sets what the search may spend. Flags out of range are
 * usage errors naming the flag, and change nothing.
 */
const hand = handWorkspaceForFile('cli-default-tune');

async function run(...argv: string[]) {
  const io = capture();
  const code = await main([...argv, '--iterations', '2', '--threads', '1', '-w', hand.file()], io, {});
  return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
}

type Tuning = { fingerprint?: string; grid: { best: Record<string, unknown> } };
function stored() {
  const db = openWorkspace(hand.file(), { readonly: true });
  try {
    const models = new ModelRepo(db).list().filter((m) => m.current);
    const tuning = (kind: string) => (models.find((m) => m.kind === kind)?.evaluation as { tuning?: Tuning } | null)?.tuning ?? null;
    return { models, tuning, fingerprint: dataFingerprint(db), ids: models.map((m) => m.id).sort() };
  } finally {
    db.close();
  }
}

describe('train flags out of range', () => {
  it.each([
    [['--budget', '0.1'], /--budget must be a number of plain fits from 0.5 to 20, got '0.1'/],
    [['--budget', '21'], /--budget must be a number of plain fits from 0.5 to 20, got '21'/],
    [['--budget', 'lots'], /--budget must be a number of plain fits from 0.5 to 20, got 'lots'/],
    [['--knn-values', 'sqrt'], /--knn-values must be presence, log or linear, got 'sqrt'/],
    [['--ease-values', 'binary'], /--ease-values must be presence, log or linear, got 'binary'/],
    [['--knn-normalize', 'max'], /--knn-normalize must be none or sum, got 'max'/],
    [['--ease-fit-half-life', '0'], /--ease-fit-half-life must be a number of days > 0 or off, got '0'/],
    [['--ease-profile-half-life=-7'], /--ease-profile-half-life must be a number of days > 0 or off, got '-7'/],
    [['--knn-fit-half-life', 'NaN'], /--knn-fit-half-life must be a number of days > 0 or off, got 'NaN'/],
    [['--knn-profile-half-life', 'soon'], /--knn-profile-half-life must be a number of days > 0 or off, got 'soon'/],
    [['--no-tune', '--tune'], /give --tune or --no-tune, not both/],
    [['--no-tune', '--budget', '2'], /--budget sets what tuning may spend; it does nothing with --no-tune/],
  ])('train %j is a usage error naming the flag, and stores nothing', async (flags, message) => {
    const r = await run('train', ...(flags as string[]));
    expect(r.code).toBe(1);
    expect(r.err).toMatch(message as RegExp);
    expect(stored().models).toHaveLength(0);
  });
});

describe('train with no tuning flags', () => {
  it('tunes on new data, reuses the tuning while the data is unchanged, and tunes again once it changes', async () => {
    // 1. First training: nothing was tuned yet, so it tunes and stores the data fingerprint with each grid.
    const first = await run('train');
    expect(first.code, first.err).toBe(0);
    expect(first.out.split('\n')[0]).toMatch(/^tuned \(random split; .*settings tried for [\d.]+ of 3 plain fits\) and trained 5 models/);
    // What was searched is printed under the table, one line per searched model.
    expect(first.out).toMatch(/^searched:$/m);
    // iALS: the scaling, then α, then λ; factors last, listing the counts the search reached (64 upward).
    expect(first.out).toMatch(/^ials: \d+ settings tried over scaling linear\/log; alpha 0.1\/1\/10\/100; regularization 0.01\/0.1\/1\/10\/100\/1000; factors 64(\/128)?(\/256)? \((budget spent|no step improved)\)$/m);
    const a = stored();
    for (const kind of ['itemknn', 'ials']) expect(a.tuning(kind)?.fingerprint).toBe(a.fingerprint);
    expect(a.tuning('content')).toBeNull(); // content has no grid: its share of the hybrid is the validated blend's
    const best = a.tuning('ials')!.grid.best;

    // 2. Same data: no search; the last tuning's settings are trained again and its record carried over.
    const second = await run('train');
    expect(second.code, second.err).toBe(0);
    expect(second.out.split('\n')[0]).toMatch(/^not tuned: the data is unchanged since the last tuning/);
    const b = stored();
    expect(b.ids).not.toEqual(a.ids); // new models were trained
    expect(b.tuning('ials')!.grid.best).toEqual(best);
    expect(b.models.find((m) => m.kind === 'ials')!.params).toMatchObject(best);

    // 3. --tune searches even on unchanged data.
    const forced = await run('train', '--tune', '--budget', '1');
    expect(forced.out.split('\n')[0]).toMatch(/^tuned .* of 1 plain fits/);

    // 4. The data changes (one signal re-valued): the next plain `train` tunes again.
    const db = openWorkspace(hand.file());
    db.prepare('UPDATE signal SET value = value + 1 WHERE id = (SELECT min(id) FROM signal)').run();
    db.close();
    const third = await run('train');
    expect(third.out.split('\n')[0]).toMatch(/^tuned /);
    expect(stored().tuning('ials')!.fingerprint).toBe(stored().fingerprint);
    expect(stored().tuning('ials')!.fingerprint).not.toBe(a.fingerprint);

    // 5. --no-tune trains the defaults and stores no tuning; the next plain `train` then tunes again.
    const plain = await run('train', '--no-tune');
    expect(plain.out.split('\n')[0]).toMatch(/^trained 5 models/);
    expect(stored().tuning('ials')).toBeNull();
    expect(stored().models.find((m) => m.kind === 'ials')!.params).toMatchObject({ regularization: 0.01, factors: 64 });
    expect((await run('train')).out.split('\n')[0]).toMatch(/^tuned /);
  }, 120_000);
});
