/**
 * The trained demo workspace a benchmark runs on: `SW_BENCH_DEMO=<file>` is copied (the copy is benchmarked, the
 * file is left as it was), else the demo shop is built, trained, into a fresh temp folder. Returns the copy's
 * path and folder, and the workspace opened with the api's handler table over it.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createHandlerTable, type HandlerTable } from '../src-main/api/handler-table.ts';
import { AppContext } from '../src-main/services/context.ts';
import { buildDemoWorkspace } from '../src-main/services/demo.ts';

export async function openBenchDemo(prefix: string): Promise<{ dir: string; file: string; app: AppContext; table: HandlerTable }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), prefix));
  const file = path.join(dir, 'demo.sqlite');
  const prebuilt = process.env['SW_BENCH_DEMO'];
  if (prebuilt) {
    fs.copyFileSync(prebuilt, file);
    console.log(`demo workspace copied from ${prebuilt}`);
  } else {
    const t0 = performance.now();
    await buildDemoWorkspace(file);
    console.log(`demo workspace built in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  }
  const app = new AppContext();
  app.open(file, { create: false });
  return { dir, file, app, table: createHandlerTable(app) };
}
