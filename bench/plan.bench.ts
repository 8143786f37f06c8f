/**
 * Rotation planner speed on the demo shop (DESIGN.md "Performance targets": plan 6 weeks × 3 shelves × 24 slots
 * in < 2 s; issue 14: 12 weeks in < 10 s). Builds the demo workspace once into a temp dir, adds an edition with
 * three 24-slot shelves over the 2,500-item catalogue (a category quota and a promoted cap; a supplier quota;
 * an audience by what it bought), loads the curation world once (timed apart: every curation call shares
 * it), then times `plan.solve` through `invoke()` 5 times each for 6 and 12 weeks, and a re-solve after a pin.
 * Prints medians of wall and CPU time (a busy shared machine inflates wall time much more than CPU time).
 *
 * Run with `npm run bench:plan`. `SW_BENCH_DEMO=<file>` copies an already built demo workspace instead of
 * building one (the copy is benchmarked; the file is left as it was).
 */
import fs from 'node:fs';
import os from 'node:os';
import { invoke } from '../src-main/api/handler-table.ts';
import { openBenchDemo } from './demo-copy.ts';

const { dir, app, table } = await openBenchDemo('sw-plan-bench-');

async function call(name: string, payload: unknown): Promise<{ value: Record<string, unknown>; ms: number; cpuMs: number }> {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const r = await invoke(table, name, payload);
  JSON.stringify(r);
  const ms = performance.now() - t0;
  const c = process.cpuUsage(c0);
  if (!r.ok) throw new Error(`${name}: ${r.error.message}`);
  return { value: r.value as Record<string, unknown>, ms, cpuMs: (c.user + c.system) / 1000 };
}

const median = (xs: number[]) => {
  const s = xs.slice().sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

const edition = 'plan bench';
await call('edition.new', { label: edition, date: '2026-11-30' });
const t0 = performance.now();
await call('shelf.add', { edition, label: 'Front', brief: { size: 24, rules: { restPeriod: 1, quotas: [{ facet: 'category', max: 4 }], promoted: { maxCount: 0.25 } } } });
console.log(`curation world loaded and the first shelf filled in ${(performance.now() - t0).toFixed(0)} ms (shared by every curation call)`);
await call('shelf.add', { edition, label: 'Newsletter', brief: { size: 24, rules: { restPeriod: 1, quotas: [{ facet: 'supplier', max: 3 }] } } });
await call('shelf.add', { edition, label: 'Indoor', brief: { size: 24, audience: { kind: 'rule', category: 'indoor plants', signalKinds: ['purchase'], withinDays: 180 }, rules: { restPeriod: 1 } } });
console.log(`load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);

for (const weeks of [6, 12]) {
  const wall: number[] = [];
  const cpu: number[] = [];
  let last: Record<string, unknown> = {};
  for (let run = 0; run < 5; run++) {
    const r = await call('plan.solve', { name: `bench ${weeks} ${run}`, shelf: 'Front', edition, shelves: ['Newsletter', 'Indoor'], start: '2026-12-07', weeks });
    wall.push(r.ms);
    cpu.push(r.cpuMs);
    last = r.value;
  }
  console.log(
    `${weeks} weeks × 3 shelves × 24 slots: median ${median(wall).toFixed(0)} ms wall, ${median(cpu).toFixed(0)} ms CPU ` +
      `(runs ${wall.map((x) => x.toFixed(0)).join(', ')} ms); ${String(last['method'])}, ${String(last['status'])}, ` +
      `${String(last['candidates'])} candidates of a pool of ${String(last['pool'])}, ${String(last['variables'])} 0-1 variables`,
  );
  const re: number[] = [];
  for (let run = 0; run < 3; run++) {
    const weeksOut = last['weeks'] as { shelves: { slots: { item: string }[] }[] }[];
    const r = await call('plan.solve', { name: `bench ${weeks} 0`, shelf: 'Front', pins: [{ item: weeksOut[0]!.shelves[0]!.slots[run]!.item, week: 3 }] });
    re.push(r.ms);
    if (run === 2) console.log(`  re-solve after a pin: median ${median(re).toFixed(0)} ms wall, ${String(r.value['changed'])} placements changed`);
  }
}
app.close();
fs.rmSync(dir, { recursive: true, force: true });
