import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { describeApiError } from '../../src-main/shell/cli/call.ts';
import { table } from '../../src-main/shell/cli/format.ts';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';
import { importSmallShop } from './small-shop.ts';

/**
 * What a new user reads after a mistake: one plain line naming the field once, and the right exit code
 * (0 ok, 1 usage, 2 data, as `shelfwright --help` promises; 1 for a wrong command line and 2 for wrong data is
 * common practice, no source).
 */

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-cli-qa-msg-'));
const ws = path.join(dir, 'shop.sqlite');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

beforeAll(() => importSmallShop(ws, path.join(dir, 'shop'), 5), 30_000);

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = capture();
  const code = await main([...argv, '-w', ws], io, {});
  return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
}

describe('api errors on the command line', () => {
  it('gives a field named both in where and in the message once', () => {
    expect(describeApiError({ code: 'input', message: 'slot: slot must be between 1 and 6, got 9', where: { column: 'slot' } })).toBe(
      'slot must be between 1 and 6, got 9',
    );
    expect(describeApiError({ code: 'input', message: "label: an edition called 'w' already exists", where: { column: 'label' } })).toBe(
      "label: an edition called 'w' already exists",
    );
    expect(describeApiError({ code: 'input', message: 'date must be a date YYYY-MM-DD, got 1', where: { column: 'date' } })).toBe(
      'date must be a date YYYY-MM-DD, got 1',
    );
  });

  it('gives a repeated schema path once and keeps file:line:column', () => {
    expect(describeApiError({ code: 'input', message: 'priceBand.min: priceBand.min: is above max (50 > 10)' })).toBe(
      'priceBand.min: is above max (50 > 10)',
    );
    expect(describeApiError({ code: 'input', message: 'price: must not be negative', where: { file: 'a.csv', line: 2, column: 4 } })).toBe(
      'a.csv:2:4: price: must not be negative',
    );
  });

  it('says a slot past the end of the shelf and a taken label once, exit 2, nothing changed', async () => {
    expect((await run('edition', 'new', 'week 1', '--date', '2026-03-02')).code).toBe(0);
    expect((await run('shelf', 'add', 'week 1', 'Front', '--size', '4')).code).toBe(0);
    const before = JSON.parse((await run('shelf', 'meter', 'week 1', 'Front', '--json')).out) as { slots: unknown[]; actions: unknown[] };
    const pin = await run('shelf', 'pin', 'week 1', 'Front', 'I00001', '--slot', '9');
    expect(pin.code).toBe(2);
    // Said as the flag typed (flag-fields.ts: the service names the field by the flag's own name).
    expect(pin.err).toBe('shelfwright shelf pin: --slot must be between 1 and 4, got 9');
    const move = await run('shelf', 'move', 'week 1', 'Front', '--from', '1', '--to', '7');
    expect(move.code).toBe(2);
    expect(move.err).toBe('shelfwright shelf move: --to: slot must be between 1 and 4, got 7');
    const after = JSON.parse((await run('shelf', 'meter', 'week 1', 'Front', '--json')).out) as typeof before;
    expect(after.slots).toEqual(before.slots);
    expect(after.actions).toEqual(before.actions);
    const again = await run('edition', 'new', 'week 1', '--date', '2026-03-09');
    expect(again.code).toBe(2);
    expect(again.err).toMatch(/^shelfwright edition new: label: an edition called 'week 1' already exists/);
    expect(again.err).not.toContain('label: label');
  });
});

describe('flag values the api would refuse are usage errors (exit 1) naming the flag', () => {
  it('train --models names the unknown model and the choices', async () => {
    for (const [value, expected] of [
      ['popularity,bogus', "'bogus' is not one of them"],
      ['', '--models takes a comma-separated list of content, itemknn, ials, ease, popularity'],
    ] as const) {
      const r = await run('train', '--models', value);
      expect(r.code).toBe(1);
      expect(r.err).toContain(expected);
      expect(r.err).toContain("Run 'shelfwright train --help'.");
    }
  });

  it('similar --n and evaluate --k say their range', async () => {
    const similar = await run('similar', 'I00001', '--n', '500');
    expect(similar.code).toBe(1);
    expect(similar.err).toContain("--n must be a whole number from 1 to 200, got '500'");
    const evaluate = await run('evaluate', '--k', '201');
    expect(evaluate.code).toBe(1);
    expect(evaluate.err).toContain("--k must be a whole number from 1 to 200, got '201'");
  });
});

describe('terminal tables', () => {
  it('end no line with spaces, even under an empty header', () => {
    const text = table(['item', 'note', ''], [['A1', '', ''], ['B22', 'x', '']]);
    for (const line of text.split('\n')) expect(line).toBe(line.trimEnd());
    expect(text.split('\n')[1]).toBe('----  ----');
  });
});
