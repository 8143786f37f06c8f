/**
 * Editorial action latency on the demo shop, end to end through the api (DESIGN.md "Performance targets":
 * an editorial action shown on screen, list + meter, < 100 ms). Builds the demo workspace once into a temp
 * dir (about 30 s with training), opens an edition with three shelves (24, 12 and 8 slots), then times 50
 * mixed actions and undos on the 24-slot shelf through `invoke()`, including the JSON a shell would send.
 * Prints median and p90 per kind, and the cold first fill separately.
 *
 * Run with `npx tsx bench/action.bench.ts`. `SW_BENCH_DEMO=<file>` copies an already built demo workspace
 * instead of building one (the copy is benchmarked; the file is left as it was).
 */
import fs from 'node:fs';
import os from 'node:os';
import { invoke } from '../src-main/api/handler-table.ts';
import { seededRng } from '../src-main/core/rng.ts';
import { openBenchDemo } from './demo-copy.ts';

interface SlotOut {
  item: string | null;
  contributions: Record<string, number>;
}
interface ShelfOut {
  slots: SlotOut[];
  meter: Record<string, unknown>;
}

const { dir, app, table } = await openBenchDemo('sw-action-bench-');
const counts = app.db.prepare('SELECT (SELECT count(*) FROM item) AS items, (SELECT count(*) FROM signal) AS signals, (SELECT max(at) FROM signal) AS last').get() as {
  items: number;
  signals: number;
  last: number;
};
const date = new Date(counts.last + 86_400_000).toISOString().slice(0, 10);
console.log(`${counts.items} items, ${counts.signals} signals, edition date ${date}; load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);

/**
 * One api call, timed from the request to the JSON a shell would send back: wall time, and this process's
 * CPU time (user + system), which a busy shared machine inflates much less than the wall time.
 */
async function call(name: string, payload: unknown): Promise<{ value: ShelfOut; ms: number; cpuMs: number; bytes: number }> {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const r = await invoke(table, name, payload);
  const json = JSON.stringify(r);
  const ms = performance.now() - t0;
  const c = process.cpuUsage(c0);
  if (!r.ok) throw new Error(`${name}: ${r.error.message}`);
  return { value: r.value as ShelfOut, ms, cpuMs: (c.user + c.system) / 1000, bytes: json.length };
}

const E = 'bench week';
const t0 = performance.now();
await call('edition.new', { label: E, date });
const coldEdition = performance.now() - t0;
const front = await call('shelf.add', { edition: E, label: 'Front', brief: { size: 24 } });
const anchorIds = (app.db.prepare('SELECT external_id FROM item ORDER BY id LIMIT 2').all() as { external_id: string }[]).map((r) => r.external_id);
const middle = await call('shelf.add', { edition: E, label: 'Group', brief: { size: 12, audience: { kind: 'group', group: 1 } } });
const last = await call('shelf.add', { edition: E, label: 'Related', brief: { size: 8, anchors: anchorIds } });
console.log(`cold: edition.new (world build) ${coldEdition.toFixed(1)} ms; first fill of the 24-slot shelf ${front.ms.toFixed(1)} ms`);
console.log(`warm: shelf.add 12 slots (group audience) ${middle.ms.toFixed(1)} ms; 8 slots (anchors) ${last.ms.toFixed(1)} ms`);
const collab = front.value.slots.filter((s) => (s.contributions['collaborative'] ?? 0) > 0 || (s.contributions['audience'] ?? 0) > 0).length;
console.log(`24-slot shelf: ${collab} of 24 slots with a collaborative or audience contribution`);

const KINDS = ['pin', 'ban', 'boost', 'move', 'undo', 'sink', 'ban', 'undo', 'redo', 'pin'] as const;
const rng = seededRng(20261201);
const times = new Map<string, number[]>();
const cpu = new Map<string, number[]>();
let view = front.value;
let bytes = 0;
for (let step = 0; step < 50; step++) {
  const kind = KINDS[step % KINDS.length]!;
  const onShelf = view.slots.map((s) => s.item).filter((x): x is string => x !== null);
  const pick = () => onShelf[rng.int(onShelf.length)]!;
  const slot = () => 1 + rng.int(24);
  let r: { value: ShelfOut; ms: number; cpuMs: number; bytes: number };
  const ref = { edition: E, shelf: 'Front' };
  if (kind === 'undo' || kind === 'redo') {
    r = await call(`shelf.${kind}`, ref);
  } else {
    const other = middle.value.slots.map((s) => s.item).filter((x): x is string => x !== null);
    const action =
      kind === 'pin'
        ? { kind, slot: slot(), item: other[rng.int(other.length)]! }
        : kind === 'ban'
          ? { kind, item: pick(), scope: 'shelf' }
          : kind === 'move'
            ? { kind, from: slot(), to: slot() }
            : { kind, item: pick(), factor: 2 };
    r = await call('shelf.act', { ...ref, action });
  }
  view = r.value;
  bytes = r.bytes;
  const list = times.get(kind) ?? [];
  list.push(r.ms);
  times.set(kind, list);
  cpu.set(kind, [...(cpu.get(kind) ?? []), r.cpuMs]);
}

const quantile = (xs: number[], q: number): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil(q * s.length) - 1)]!;
};
const all: number[] = [];
const allCpu: number[] = [];
const row = (kind: string, xs: number[], cs: number[]) =>
  console.log(
    `${kind.padEnd(7)} ${String(xs.length).padStart(4)} ${[quantile(xs, 0.5), quantile(xs, 0.9), quantile(cs, 0.5), quantile(cs, 0.9)].map((x) => x.toFixed(1).padStart(10)).join('')}`,
  );
console.log('kind    runs median ms    p90 ms  cpu median   cpu p90');
for (const [kind, xs] of times) {
  all.push(...xs);
  allCpu.push(...cpu.get(kind)!);
  row(kind, xs, cpu.get(kind)!);
}
row('all', all, allCpu);
console.log(`last response ${(bytes / 1024).toFixed(1)} KiB of JSON; load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
app.close();
fs.rmSync(dir, { recursive: true, force: true });
