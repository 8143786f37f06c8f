import { expect } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { seedWorkspace, tempFile } from '../curation-services/fixture.ts';
import { capture } from './capture.ts';

/**
 * The command line on a fresh seeded workspace (40 items in 4 categories, 5 suppliers, 30 customers):
 * `run` gives exit code and output, `json` runs with --json and expects success.
 */
export function seededCli(name = 'cli.sqlite') {
  const file = tempFile(name);
  const db = openWorkspace(file);
  seedWorkspace(db);
  db.close();
  const run = async (...argv: string[]) => {
    const io = capture();
    const code = await main([...argv, '-w', file], io, {});
    return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
  };
  // Untyped by default, as JSON.parse is: the tests read many shapes of output and check them as they go.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  const json = async <T = any>(...argv: string[]): Promise<T> => {
    const r = await run(...argv, '--json');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    return JSON.parse(r.out) as T;
  };
  return { file, run, json };
}
