/**
 * Writes the demo shop's files. Usage:
 *   npx tsx demo-data/generate.ts [--seed N] [--out DIR] [--items N] [--customers N] [--signals N]
 * Defaults: seed 7, demo-data/out, 2,500 items, 15,000 customers, 400,000 signals.
 */
import { fileURLToPath } from 'node:url';
import { resolve } from 'node:path';
import { InputError } from '../src-main/core/errors.ts';
import { generateDemoShop, type DemoShopOptions } from './generator/index.ts';

const NUMERIC = ['seed', 'items', 'customers', 'signals'] as const;

export function parseArgs(argv: readonly string[]): DemoShopOptions {
  const opts: DemoShopOptions = { outDir: fileURLToPath(new URL('./out', import.meta.url)) };
  for (let k = 0; k < argv.length; k++) {
    const flag = argv[k]!;
    const value = argv[k + 1];
    const name = flag.replace(/^--/, '');
    if (!flag.startsWith('--') || value === undefined) {
      throw new InputError(`expected --seed, --out, --items, --customers or --signals followed by a value, got '${flag}'`);
    }
    k++;
    if (name === 'out') opts.outDir = resolve(value);
    else if ((NUMERIC as readonly string[]).includes(name)) {
      if (!/^\d+$/.test(value)) throw new InputError(`--${name} needs a whole number, got '${value}'`);
      opts[name as (typeof NUMERIC)[number]] = Number(value);
    } else throw new InputError(`unknown option '${flag}'`);
  }
  return opts;
}

async function main(): Promise<void> {
  const started = performance.now();
  const summary = await generateDemoShop(parseArgs(process.argv.slice(2)));
  const seconds = ((performance.now() - started) / 1000).toFixed(2);
  console.log(
    `${summary.shop}: ${summary.items} items, ${summary.customers} customers, ${summary.signals} signals ` +
      `(${summary.window.start} to ${summary.window.end}, seed ${summary.seed}) in ${seconds} s -> ${summary.files.items.replace(/items\.csv$/, '')}`,
  );
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((e: unknown) => {
    console.error(e instanceof InputError ? `error: ${e.describe()}` : e);
    process.exitCode = 1;
  });
}
