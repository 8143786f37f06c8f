import type { CliIo } from '../../src-main/shell/cli/command.ts';

/** An io that keeps what a command printed, for assertions. */
export function capture(): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (t) => stdout.push(t), err: (t) => stderr.push(t), errIsTty: false };
}
