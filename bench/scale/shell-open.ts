/**
 * What opening the app on a workspace costs, through the api the web shell serves (the same handler table): the
 * calls the page makes on its first screen (workspace.info, workspace.stats, models.list, edition.list), then an
 * edition and a first 24-slot shelf (the curation world is built on the first edition call), then one editorial
 * action. Prints one JSON line of wall milliseconds per call.
 *   npx tsx bench/scale/shell-open.ts WORKSPACE   (the workspace is opened read-write: pass a copy)
 */
import { invoke } from '../../src-main/api/handler-table.ts';
import { createHandlerTable } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';

const file = process.argv[2];
if (!file) throw new Error('usage: shell-open.ts WORKSPACE');
const app = new AppContext();
app.open(file, { create: false });
const table = createHandlerTable(app);
const times: Record<string, number> = {};

async function call(name: string, payload: unknown, label = name): Promise<unknown> {
  const t0 = performance.now();
  const r = await invoke(table, name, payload);
  JSON.stringify(r); // what a shell sends
  times[label] = Math.round(performance.now() - t0);
  if (!r.ok) throw new Error(`${name}: ${r.error.message}`);
  return r.value;
}

await call('workspace.info', {});
await call('workspace.stats', {});
await call('models.list', {});
await call('edition.list', {});
await call('edition.new', { label: 'scale week', date: '2026-12-07' });
const shelf = (await call('shelf.add', { edition: 'scale week', label: 'Front', brief: { size: 24 } })) as { slots: { item: string | null }[] };
const first = shelf.slots.find((s) => s.item)?.item;
if (first) await call('shelf.act', { edition: 'scale week', shelf: 'Front', action: { kind: 'ban', item: first } }, 'shelf.act ban');
app.close();
console.log(JSON.stringify(times));
