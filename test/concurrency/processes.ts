import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const ROOT = path.resolve(import.meta.dirname, '../..');
const BIN = path.join(ROOT, 'bin/shelfwright.js');
const HOLDER = path.join(import.meta.dirname, 'write-holder.ts');

/** A child process whose output the test reads as it comes, and waits on by content, never by time. */
export interface Proc {
  readonly pid: number;
  out(): string;
  err(): string;
  /** Resolves once `stream` has printed `text`; rejects (with what was printed) if the process ends first. */
  waitFor(stream: 'stdout' | 'stderr', text: string): Promise<void>;
  /** Writes one line to its stdin. */
  send(line: string): void;
  exit: Promise<number | null>;
}

export interface SpawnOptions {
  env?: NodeJS.ProcessEnv;
  /** Run as another user (the read-only tests, when the tests run as root). */
  uid?: number;
  gid?: number;
}

function start(args: string[], o: SpawnOptions = {}): Proc {
  const child = spawn(process.execPath, args, {
    cwd: ROOT,
    env: { ...process.env, ...o.env },
    stdio: ['pipe', 'pipe', 'pipe'],
    ...(o.uid !== undefined && { uid: o.uid }),
    ...(o.gid !== undefined && { gid: o.gid }),
  });
  const text = { stdout: '', stderr: '' };
  const waiters: { stream: 'stdout' | 'stderr'; text: string; resolve: () => void; reject: (e: Error) => void }[] = [];
  const check = () => {
    for (const w of [...waiters]) {
      if (text[w.stream].includes(w.text)) {
        waiters.splice(waiters.indexOf(w), 1);
        w.resolve();
      }
    }
  };
  for (const stream of ['stdout', 'stderr'] as const) {
    child[stream].on('data', (d: Buffer) => {
      text[stream] += d.toString();
      check();
    });
  }
  const exit = new Promise<number | null>((resolve) => child.on('close', (code) => resolve(code)));
  void exit.then((code) => {
    for (const w of waiters.splice(0)) {
      w.reject(new Error(`process ended (exit ${code}) before printing '${w.text}' on ${w.stream}\nstdout: ${text.stdout}\nstderr: ${text.stderr}`));
    }
  });
  return {
    pid: child.pid!,
    out: () => text.stdout,
    err: () => text.stderr,
    waitFor: (stream, t) =>
      new Promise<void>((resolve, reject) => {
        waiters.push({ stream, text: t, resolve, reject });
        check();
        if (child.exitCode !== null) void exit.then(() => check());
      }),
    send: (line) => child.stdin.write(`${line}\n`),
    exit,
  };
}

/** The real `shelfwright` command in its own process. */
export function cli(args: string[], o: SpawnOptions = {}): Proc {
  return start([BIN, ...args], o);
}

/**
 * A second Shelfwright process that does one real write (write-holder.ts) and keeps its transaction open
 * until told on stdin: it prints `ready` once it holds the write lock, `released` after its commit.
 */
export function holder(file: string, ...action: string[]): Proc {
  return start(['--import', 'tsx', HOLDER, file, ...action]);
}

/**
 * A named pipe as a signal file: an import reading it holds its write transaction until `end()` (the
 * import takes the workspace's write lock before it opens its file, so `opened` means "locked").
 */
export function signalPipe(dir: string, header: string) {
  const file = path.join(dir, `feed-${process.hrtime.bigint()}.csv`);
  fs.rmSync(file, { force: true });
  // mkfifo(1): Node has no binding for mkfifo(3).
  if (spawnSync('mkfifo', [file]).status !== 0) throw new Error(`mkfifo ${file} failed`);
  const stream = fs.createWriteStream(file);
  const opened = new Promise<void>((resolve) => stream.once('open', () => resolve()));
  stream.write(`${header}\n`);
  return {
    file,
    /** Resolves when the importing process has opened the pipe (and so holds the write lock). */
    opened,
    end: (rows: string[]) => new Promise<void>((resolve) => stream.end(rows.map((r) => `${r}\n`).join(''), () => resolve())),
  };
}
