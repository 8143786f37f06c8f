import { Worker, type WorkerOptions } from 'node:worker_threads';

/**
 * tsx's loader, resolved from this file: an eval'd worker resolves bare names from the process's current
 * folder, so `shelfwright train` run from another folder would not find tsx. Where import.meta.resolve is
 * missing (some test runners' module systems), the bare name is kept.
 */
const TSX_API: string = (() => {
  try {
    return import.meta.resolve('tsx/esm/api');
  } catch {
    return 'tsx/esm/api';
  }
})();

/**
 * Starts a worker thread from a module URL. Built code (.js) starts directly. Source (.ts, under tsx or
 * vitest) cannot: on Node 20 `execArgv: ['--import', 'tsx']` fails with ERR_UNKNOWN_FILE_EXTENSION, so
 * the worker first registers tsx's loader and then imports the file (the workaround recorded in the
 * project's toolchain notes). Lives in ingest, the lowest layer that starts threads, so the importer and
 * the services (services/train/spawn.ts re-exports it) share one implementation.
 */
export function spawnWorker(url: URL, options: WorkerOptions = {}): Worker {
  if (url.pathname.endsWith('.ts')) {
    const boot = `import(${JSON.stringify(TSX_API)}).then((m) => { m.register(); return import(${JSON.stringify(url.href)}); })`;
    return new Worker(boot, { ...options, eval: true });
  }
  return new Worker(url, options);
}

/** A sibling module's URL: `<name>.ts` under tsx and vitest, `<name>.js` beside a built bundle. */
export function siblingModule(base: string, name: string): URL {
  return new URL(base.endsWith('.ts') ? `./${name}.ts` : `./${name}.js`, base);
}
