/**
 * Seeded synthetic logs shaped like the large public logs editors bring (never the logs themselves): Zipf item
 * popularity, heavy-tailed history lengths and counts. Three shapes, each scalable by `--scale` (1 = full size):
 *
 *   counts   ~360,000 customers × ~160,000 items, ~17M (customer, item, count) rows, counts up to 300,000, no times
 *   wide     ~1,000 customers with thousands of distinct items each (~50,000 items, ~3M rows, times)
 *   repeats  ~200,000 customers × ~50,000 items, ~30M lines with times and many repeats of one pair
 *
 * Writes `items.csv` and `signals.csv` into `--out` (default /tmp/sw-scale/<shape>-<scale>), never into the repo.
 *   npx tsx bench/scale/generate.ts --shape counts --scale 0.1 [--seed 7] [--out DIR]
 */
import fs from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { seededRng, type Rng } from '../../src-main/core/rng.ts';

export type Shape = 'counts' | 'wide' | 'repeats';

interface ShapeSpec {
  customers: number;
  items: number;
  /** Target signal lines (before scaling). */
  lines: number;
  /** Zipf exponent of item popularity. */
  zipf: number;
  /** Pareto shape of history lengths (smaller = heavier tail). */
  lengthShape: number;
  /** Count column (customer, item, count) and no times, or one line per event with a time. */
  counts: boolean;
  /** Mean extra lines on an already-chosen pair (repeats of one pair). */
  repeatMean: number;
}

export const SHAPES: Record<Shape, ShapeSpec> = {
  counts: { customers: 360_000, items: 160_000, lines: 17_000_000, zipf: 0.9, lengthShape: 1.6, counts: true, repeatMean: 0 },
  wide: { customers: 1_000, items: 50_000, lines: 3_000_000, zipf: 0.8, lengthShape: 2.5, counts: false, repeatMean: 0.3 },
  repeats: { customers: 200_000, items: 50_000, lines: 30_000_000, zipf: 1.0, lengthShape: 1.5, counts: false, repeatMean: 4 },
};

/** Inverse-CDF sampler of a Zipf law over n ranks (rank 0 most popular), items shuffled so id order says nothing. */
function zipfSampler(n: number, s: number, rng: Rng): () => number {
  const cdf = new Float64Array(n);
  let acc = 0;
  for (let r = 0; r < n; r++) cdf[r] = acc += 1 / Math.pow(r + 1, s);
  for (let r = 0; r < n; r++) cdf[r] = cdf[r]! / acc;
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  for (let i = n - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    const t = perm[i]!;
    perm[i] = perm[j]!;
    perm[j] = t;
  }
  return () => {
    const u = rng.next();
    let lo = 0;
    let hi = n - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (cdf[mid]! < u) lo = mid + 1;
      else hi = mid;
    }
    return perm[lo]!;
  };
}

/** Pareto(x_m, a) draw: heavy-tailed, mean x_m·a/(a−1). */
const pareto = (rng: Rng, xm: number, a: number): number => xm / Math.pow(1 - rng.next(), 1 / a);

/** A buffered writer: strings gathered into ~4 MB chunks, written synchronously. */
class Lines {
  private parts: string[] = [];
  private size = 0;
  constructor(private readonly fd: number) {}
  push(line: string): void {
    this.parts.push(line);
    this.size += line.length;
    if (this.size > 4_000_000) this.flush();
  }
  flush(): void {
    fs.writeSync(this.fd, this.parts.join(''));
    this.parts = [];
    this.size = 0;
  }
}

export function generate(shape: Shape, scale: number, seed: number, out: string): { items: string; signals: string; lines: number } {
  const spec = SHAPES[shape];
  const rng = seededRng(seed);
  const nItems = Math.max(50, Math.round(spec.items * scale));
  // The wide shape keeps its ~1,000 customers at any scale (its point is thousands of items per customer).
  const nCustomers = shape === 'wide' ? Math.max(50, Math.round(spec.customers * Math.min(1, scale * 4))) : Math.max(50, Math.round(spec.customers * scale));
  const target = Math.round(spec.lines * scale);
  fs.mkdirSync(out, { recursive: true });

  const itemsPath = path.join(out, 'items.csv');
  const ifd = fs.openSync(itemsPath, 'w');
  const iw = new Lines(ifd);
  iw.push('id,title,category,supplier\n');
  for (let i = 0; i < nItems; i++) iw.push(`i${i},Item ${i},c${i % 40},s${(i * 7919) % 500}\n`);
  iw.flush();
  fs.closeSync(ifd);

  const draw = zipfSampler(nItems, spec.zipf, rng);
  // History lengths: Pareto, rescaled so their sum is about the target line count (repeats included).
  const raw = new Float64Array(nCustomers);
  let sum = 0;
  for (let c = 0; c < nCustomers; c++) sum += raw[c] = pareto(rng, 1, spec.lengthShape);
  const perPair = 1 + spec.repeatMean;
  const scaleLen = target / perPair / sum;
  const signalsPath = path.join(out, 'signals.csv');
  const sfd = fs.openSync(signalsPath, 'w');
  const sw = new Lines(sfd);
  sw.push(spec.counts ? 'user_id,item_id,count\n' : 'user_id,item_id,timestamp\n');
  const t0 = Date.UTC(2024, 0, 1) / 1000;
  const span = 365 * 86400;
  const seen = new Set<number>();
  let lines = 0;
  for (let c = 0; c < nCustomers; c++) {
    const len = Math.min(Math.floor(nItems * 0.6), Math.max(1, Math.round(raw[c]! * scaleLen)));
    seen.clear();
    let guard = 0;
    while (seen.size < len && guard++ < len * 20) {
      const it = draw();
      if (seen.has(it)) continue;
      seen.add(it);
      if (spec.counts) {
        // Play counts: Pareto tail, capped at 300,000 as in the largest public count logs.
        const count = Math.min(300_000, Math.floor(pareto(rng, 1, 0.9)));
        sw.push(`u${c},i${it},${count}\n`);
        lines++;
      } else {
        const reps = 1 + Math.min(500, Math.floor(spec.repeatMean > 0 ? pareto(rng, spec.repeatMean / 3, 1.4) - spec.repeatMean / 3 : 0));
        for (let r = 0; r < reps; r++) {
          const at = new Date((t0 + Math.floor(rng.next() * span)) * 1000).toISOString().slice(0, 19) + 'Z';
          sw.push(`u${c},i${it},${at}\n`);
          lines++;
        }
      }
    }
  }
  sw.flush();
  fs.closeSync(sfd);
  return { items: itemsPath, signals: signalsPath, lines };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const { values } = parseArgs({
    options: { shape: { type: 'string', default: 'counts' }, scale: { type: 'string', default: '0.1' }, seed: { type: 'string', default: '7' }, out: { type: 'string' } },
  });
  const shape = values.shape as Shape;
  if (!(shape in SHAPES)) throw new Error(`--shape must be one of ${Object.keys(SHAPES).join(', ')}`);
  const scale = Number(values.scale);
  const out = values.out ?? `/tmp/sw-scale/${shape}-${values.scale}`;
  const t = performance.now();
  const r = generate(shape, scale, Number(values.seed), out);
  console.log(`${shape} × ${scale}: ${r.lines.toLocaleString('en')} signal lines in ${((performance.now() - t) / 1000).toFixed(1)} s -> ${out}`);
}
