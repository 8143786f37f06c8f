import { expect } from 'vitest';
import type { CliIo } from '../../src-main/shell/cli/command.ts';
import { main } from '../../src-main/shell/cli/main.ts';

/** An io that keeps what a command printed, for assertions. */
export function capture(): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (t) => stdout.push(t), err: (t) => stderr.push(t), errIsTty: false };
}

/**
 * `run(...argv)` runs the CLI on the workspace `workspace()` names (read at each call: tests set it in beforeAll)
 * and returns its exit code and output; `json(...argv)` adds --json, expects success and parses stdout.
 */
export function workspaceCli(workspace: () => string) {
  const run = async (...argv: string[]) => {
    const io = capture();
    const code = await main([...argv, '-w', workspace()], io, {});
    return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
  };
  const json = async (...argv: string[]) => {
    const r = await run(...argv, '--json');
    expect(r.code, r.err).toBe(0);
    return JSON.parse(r.out);
  };
  return { run, json };
}
