/**
 * Child processes of the quality benchmark: the `shelfwright` command itself (so the benchmark goes through
 * the real import, train and evaluate paths, the api's handler table, exactly as a user's shell does) and the
 * Python reference.
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** The checkout this harness lives in (the reference and the metric cross-check come from here). */
export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

export interface Finished {
  code: number;
  stdout: string;
  stderr: string;
  ms: number;
}

/** Runs a command to its end; stderr is also copied to `log` (progress lines stay visible in the file). */
export function run(cmd: string, args: string[], o: { log?: string; env?: NodeJS.ProcessEnv } = {}): Promise<Finished> {
  const started = performance.now();
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { cwd: ROOT, env: o.env ?? process.env, stdio: ['ignore', 'pipe', 'pipe'] });
    const out: Buffer[] = [];
    const err: Buffer[] = [];
    const log = o.log ? fs.createWriteStream(o.log) : null;
    child.stdout.on('data', (b: Buffer) => out.push(b));
    child.stderr.on('data', (b: Buffer) => {
      err.push(b);
      log?.write(b);
    });
    child.on('error', reject);
    child.on('close', (code) => {
      log?.end();
      resolve({ code: code ?? -1, stdout: Buffer.concat(out).toString('utf8'), stderr: Buffer.concat(err).toString('utf8'), ms: performance.now() - started });
    });
  });
}

/**
 * `shelfwright <args> -w workspace --json` of the checkout at `root` (another worktree can be measured with
 * this harness), its JSON answer parsed; a failure stops the benchmark with the CLI's own message.
 */
export async function cli<T>(root: string, workspace: string, args: string[], log?: string): Promise<{ body: T; ms: number }> {
  const r = await run(process.execPath, [path.join(root, 'bin', 'shelfwright.js'), ...args, '-w', workspace, '--json'], log ? { log } : {});
  if (r.code !== 0) throw new Error(`shelfwright ${args.join(' ')} failed (exit ${r.code}): ${r.stdout.slice(0, 2000)} ${r.stderr.slice(-2000)}`);
  return { body: JSON.parse(r.stdout) as T, ms: r.ms };
}

/** Debian's python3 with numpy, scipy and scikit-learn, or why it cannot be used. */
export async function findPython(): Promise<{ python: string } | { missing: string }> {
  const python = process.env.SHELFWRIGHT_PYTHON ?? '/usr/bin/python3';
  if (!fs.existsSync(python)) return { missing: `${python} not found (apt-get install python3-numpy python3-scipy python3-sklearn)` };
  const r = await run(python, ['-c', 'import numpy, scipy, sklearn; print(numpy.__version__, scipy.__version__, sklearn.__version__)']);
  if (r.code !== 0) return { missing: `${python} lacks numpy/scipy/sklearn (apt-get install python3-numpy python3-scipy python3-sklearn): ${r.stderr.trim().split('\n').pop()}` };
  return { python };
}
