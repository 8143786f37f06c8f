/**
 * The demo shop generator: an invented online garden-supply shop (see demo-data/README.md) written
 * as items.csv (with a picture per item in pictures/), customers.csv, signals.csv and the hidden answer,
 * truth.json. Deterministic: the same
 * options give byte-identical files (one seeded Rng per part, a fixed calendar, no clock).
 */
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { basename, join } from 'node:path';
import { InputError } from '../../src-main/core/errors.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { SIGNAL_KINDS } from '../../src-main/core/types.ts';
import { CATALOGUE_START_S, WEEK_S, WINDOW_END_S, WINDOW_START_S, isoDate, isoTimeFormatter } from './calendar.ts';
import { generateCatalogue, type DemoItem } from './catalogue.ts';
import { csvField, writeCsv } from './csv.ts';
import { buildDemand } from './demand.ts';
import { generateCustomers, type DemoCustomer } from './people.ts';
import { PICTURE_DIR, assignPictures, writePictures } from './pictures.ts';
import { CATEGORIES, GROUPS, SHOP_NAME, type Category } from './scenario.ts';
import { generateSignals, timeOrder, type SignalTable } from './signals.ts';

export interface DemoShopOptions {
  seed?: number;
  items?: number;
  customers?: number;
  signals?: number;
  outDir: string;
}

export interface DemoSummary {
  shop: string;
  seed: number;
  items: number;
  customers: number;
  signals: number;
  /** First and last day of the signal window (YYYY-MM-DD, inclusive). */
  window: { start: string; end: string };
  files: { items: string; customers: string; signals: string; truth: string };
  /** The picture files the image column of items.csv names (under `pictures/` beside it). */
  pictures: string[];
}

export const ITEMS_HEADER = 'id,title,description,category,tags,supplier,price,added_at,promoted,available,image';
export const CUSTOMERS_HEADER = 'id,region,joined_at';
export const SIGNALS_HEADER = 'customer,item,kind,value,at';
export const DEMO_DEFAULTS = { seed: 7, items: 2500, customers: 15_000, signals: 400_000 } as const;

function wholeNumber(name: string, value: number, min: number, max: number): number {
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new InputError(`${name} must be a whole number from ${min} to ${max}, got ${value}`, { column: name });
  }
  return value;
}

export async function generateDemoShop(opts: DemoShopOptions): Promise<DemoSummary> {
  const seed = wholeNumber('seed', opts.seed ?? DEMO_DEFAULTS.seed, 0, 0xffffffff);
  // At least a few items per taste group, and at most what a 32-bit row index and memory allow.
  const nItems = wholeNumber('items', opts.items ?? DEMO_DEFAULTS.items, 5 * GROUPS.length, 200_000);
  const nCustomers = wholeNumber('customers', opts.customers ?? DEMO_DEFAULTS.customers, GROUPS.length, 2_000_000);
  const nSignals = wholeNumber('signals', opts.signals ?? DEMO_DEFAULTS.signals, 1, 50_000_000);

  // Separate streams per part: changing how signals are drawn does not reshuffle the catalogue.
  const items = generateCatalogue(seededRng(seed), nItems);
  const customers = generateCustomers(seededRng(seed ^ 0x9e3779b9), nCustomers);
  const demand = buildDemand(items, seededRng(seed ^ 0x85ebca6b));
  const signals = generateSignals(seededRng(seed ^ 0xc2b2ae35), items, customers, demand, nSignals);
  const order = timeOrder(signals);
  const pictureRng = seededRng(seed ^ 0x27d4eb2f);
  const itemPictures = assignPictures(pictureRng, items.map((it) => it.category));

  await mkdir(opts.outDir, { recursive: true });
  const files = {
    items: join(opts.outDir, 'items.csv'),
    customers: join(opts.outDir, 'customers.csv'),
    signals: join(opts.outDir, 'signals.csv'),
    truth: join(opts.outDir, 'truth.json'),
  };
  // Each file is written under a temporary name and renamed only once all four are complete, so a
  // failed run never leaves a half-written shop for the importer to pick up.
  const partial = (path: string): string => path + '.partial';
  // The pictures go to their own temporary folder, swapped in with the files (their paths are those after the swap).
  const pictureDir = join(opts.outDir, PICTURE_DIR);
  let written: string[];
  try {
    written = await writePictures(pictureRng, partial(pictureDir));
    await writeFiles(files, partial, items, itemPictures, customers, signals, order, seed);
  } catch (e) {
    await Promise.allSettled([...Object.values(files).map((f) => rm(partial(f), { force: true })), rm(partial(pictureDir), { recursive: true, force: true })]);
    throw e;
  }
  await rm(pictureDir, { recursive: true, force: true });
  await rename(partial(pictureDir), pictureDir);
  for (const f of Object.values(files)) await rename(partial(f), f);
  const pictures = written.map((f) => join(pictureDir, basename(f)));
  return {
    shop: SHOP_NAME,
    seed,
    items: items.length,
    customers: customers.length,
    signals: order.length,
    window: { start: isoDate(WINDOW_START_S), end: isoDate(WINDOW_END_S - 1) },
    files,
    pictures,
  };
}

async function writeFiles(
  files: DemoSummary['files'],
  partial: (path: string) => string,
  items: readonly DemoItem[],
  pictures: readonly string[],
  customers: readonly DemoCustomer[],
  signals: SignalTable,
  order: Uint32Array,
  seed: number,
): Promise<void> {
  const money = (cents: number): string => `${Math.floor(cents / 100)}.${String(cents % 100).padStart(2, '0')}`;
  await writeCsv(partial(files.items), ITEMS_HEADER, items.length, (k) => {
    const it = items[k]!;
    return [
      it.id,
      csvField(it.title),
      csvField(it.description),
      csvField(CATEGORIES[it.category]!),
      csvField(it.tags.join('|')),
      csvField(it.supplier),
      money(it.priceCents),
      isoDate(CATALOGUE_START_S + it.addedWeek * WEEK_S),
      String(it.promoted),
      String(it.available),
      pictures[k]!,
    ].join(',');
  });
  await writeCsv(partial(files.customers), CUSTOMERS_HEADER, customers.length, (k) => {
    const c = customers[k]!;
    return `${c.id},${c.region},${isoDate(c.joinedS)}`;
  });
  const iso = isoTimeFormatter();
  await writeCsv(partial(files.signals), SIGNALS_HEADER, order.length, (k) => {
    const s = order[k]!;
    const kind = SIGNAL_KINDS[signals.kind[s]!]!;
    return `${customers[signals.customer[s]!]!.id},${items[signals.item[s]!]!.id},${kind},${signals.value[s]},${iso(signals.at[s]!)}`;
  });
  const truth = {
    seed,
    groups: GROUPS.map((g) => ({
      id: g.id,
      name: g.name,
      description: g.description,
      topCategories: (Object.entries(g.categories) as [Category, number][])
        .sort((a, b) => b[1] - a[1])
        .slice(0, 3)
        .map(([c]) => c),
    })),
    itemGroup: Object.fromEntries(items.map((it) => [it.id, GROUPS[it.group]!.id])),
    customerGroup: Object.fromEntries(customers.map((c) => [c.id, GROUPS[c.group]!.id])),
  };
  await writeFile(partial(files.truth), JSON.stringify(truth, null, 1) + '\n');
}
