import { Worker, type WorkerOptions } from 'node:worker_threads';

/**
 * Starts a worker thread from a module URL. Built code (.js) starts directly. Source (.ts, under tsx or
 * vitest) cannot: on Node 20 `execArgv: ['--import', 'tsx']` fails with ERR_UNKNOWN_FILE_EXTENSION, so
 * the worker first registers tsx's loader and then imports the file (the workaround recorded in the
 * project's toolchain notes).
 */
export function spawnWorker(url: URL, options: WorkerOptions = {}): Worker {
  if (url.pathname.endsWith('.ts')) {
    const boot = `import('tsx/esm/api').then((m) => { m.register(); return import(${JSON.stringify(url.href)}); })`;
    return new Worker(boot, { ...options, eval: true });
  }
  return new Worker(url, options);
}
