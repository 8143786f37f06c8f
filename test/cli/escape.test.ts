import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { escapeControls } from '../../src-main/shell/cli/escape.ts';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';

/** Issue 11 part 4: a title carrying terminal escape sequences cleared the screen and retitled the terminal. */
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-cli-escape-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const ws = path.join(dir, 'w.sqlite');
// OSC 0 (set window title, ended by BEL) and CSI 2 J (erase display): ECMA-48 sections 5.6 and 8.3.39.
const HOSTILE = 'Lamp\u001b]0;owned\u0007\u001b[2J';
// eslint-disable-next-line no-control-regex -- the test looks for raw control characters
const RAW = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/;

describe('escapeControls', () => {
  it('shows C0, DEL and C1 (ECMA-48) as visible escapes and keeps line feeds and ordinary text', () => {
    expect(escapeControls(`${HOSTILE}\n\tx\r\u007f\u009b é`)).toBe('Lamp\\x1b]0;owned\\x07\\x1b[2J\n\\tx\\r\\x7f\\x9b é');
  });
  it('in JSON form uses JSON escapes, so the output parses to the very same string (RFC 8259 section 7)', () => {
    const out = escapeControls(JSON.stringify({ title: 'a\u009b[2Jb\u007f' }), 'json');
    expect(RAW.test(out)).toBe(false);
    expect(JSON.parse(out)).toEqual({ title: 'a\u009b[2Jb\u007f' });
  });
});

describe('the command line prints user data escaped', () => {
  const file = path.join(dir, 'items.csv');
  fs.writeFileSync(file, `id,title,category\nb1,"${HOSTILE}","beds\u009b2J"\n`);

  it('in text: the preview table and the stats', async () => {
    const preview = capture();
    expect(await main(['import', 'items', file, '-w', ws, '--preview'], preview, {})).toBe(0);
    const text = preview.stdout.join('\n');
    expect(RAW.test(text)).toBe(false);
    expect(text).toContain('Lamp\\x1b]0;owned\\x07\\x1b[2J');
    expect(await main(['import', 'items', file, '-w', ws], capture(), {})).toBe(0);
    const stats = capture();
    expect(await main(['stats', '-w', ws], stats, {})).toBe(0);
    expect(RAW.test(stats.stdout.join('\n'))).toBe(false);
    expect(stats.stdout.join('\n')).toContain('beds\\x9b2J');
  });

  it('under --json: still parses to the stored text', async () => {
    const io = capture();
    expect(await main(['import', 'items', file, '-w', ws, '--preview', '--json'], io, {})).toBe(0);
    const out = io.stdout.join('\n');
    expect(RAW.test(out)).toBe(false);
    expect(JSON.parse(out).sampleRows[0]).toEqual(['b1', HOSTILE, 'beds\u009b2J']);
  });

  it('in messages on stderr', async () => {
    const bad = path.join(dir, 'bad.csv');
    fs.writeFileSync(bad, 'id,title\nb\u001b[2J,Jar\n');
    const io = capture();
    expect(await main(['import', 'items', bad, '-w', ws], io, {})).toBe(2);
    expect(RAW.test(io.stderr.join('\n'))).toBe(false);
    expect(io.stderr.join('\n')).toContain("an id may not hold control characters; 'b?[2J' has U+001B at character 2");
  });
});
