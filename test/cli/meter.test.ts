import { describe, expect, it } from 'vitest';
import { seededCli } from './seeded-cli.ts';

describe('shelfwright shelf targets and the meter', () => {
  it('sets target bands without refilling, prints them by the app’s names, and refuses a band off the scale', async () => {
    const { run, json } = seededCli();
    await run('edition', 'new', 'w', '--date', '2026-03-02');
    const before = await json('shelf', 'add', 'w', 'Front', '--size', '5');
    const set = await run('shelf', 'targets', 'w', 'Front', '--variety', '0.45:0.9', '--price-of-choices', ':10%', '--median-age', ':90');
    expect(set.code).toBe(0);
    expect(set.out).toMatch(/^Variety +\d\.\d\d +0–1 +target 0\.45 to 0\.90 +(on|below|above) target$/m);
    expect(set.out).toMatch(/^Price of choices +\d+% +0–100% +target 10% or less/m);
    expect(set.out).toMatch(/^Median age +[\d,]+ days? +days, 0 and up +target 90 days or less/m);
    const after = await json('shelf', 'meter', 'w', 'Front');
    expect(after.brief.targets).toEqual({ intraListDistance: { min: 0.45, max: 0.9 }, choiceCost: { max: 0.1 }, ageMedianDays: { max: 90 } });
    // A band changes how readings are judged, never the list.
    expect(after.slots).toEqual(before.slots);
    expect(after.actions).toEqual(before.actions);

    const back = await json('shelf', 'targets', 'w', 'Front', '--default', 'variety', '--novelty', 'none');
    expect(back.brief.targets).toEqual({ choiceCost: { max: 0.1 }, ageMedianDays: { max: 90 }, novelty: {} });

    const off = await run('shelf', 'targets', 'w', 'Front', '--calibration-gap', ':2.9');
    expect(off.code).not.toBe(0);
    expect(off.err).toMatch(/Calibration gap: the target's upper end must be within 0–1, got 2\.90/);
    const unchanged = await json('shelf', 'meter', 'w', 'Front');
    expect(unchanged.brief.targets).toEqual(back.brief.targets);
    const percent = await run('shelf', 'targets', 'w', 'Front', '--variety', '40%:');
    expect(percent.err).toMatch(/--variety is not a share: give a plain number/);
  });
});
