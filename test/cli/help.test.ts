import { describe, expect, it } from 'vitest';
import { COMMANDS } from '../../src-main/shell/cli/commands/index.ts';
import { commandHelp, main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';

describe('--help on every command', () => {
  it('describes every flag a command accepts, and only those', () => {
    for (const c of COMMANDS) {
      expect(Object.keys(c.about).sort(), c.name).toEqual(Object.keys(c.options).sort());
      for (const [flag, text] of Object.entries(c.about)) expect(text.trim().length, `${c.name} --${flag}`).toBeGreaterThan(10);
    }
  });

  it('prints each flag beside its description, the global ones included', async () => {
    const io = capture();
    expect(await main(['import', '--help'], io, {})).toBe(0);
    const text = io.stdout.join('\n');
    expect(text).toMatch(/--date-order VALUE\s+dmy or mdy/);
    expect(text).toMatch(/--mapping-file VALUE\s+a JSON file/);
    expect(text).toMatch(/-w, --workspace PATH\s+the workspace file/);
    expect(commandHelp(COMMANDS.find((c) => c.name === 'stats')!)).toMatch(/--json\s+machine-readable output/);
  });
});
