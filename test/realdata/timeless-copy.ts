import fs from 'node:fs';
import path from 'node:path';
import Papa from 'papaparse';

/**
 * The UCI "Online Retail" slice (Chen 2015, UCI Machine Learning Repository, doi:10.24432/C5BW33, CC BY 4.0;
 * test/fixtures/online-retail/README.md) with its times stripped, written into `dir` at test time: the signals
 * summed into one (customer, product, quantity) row per pair, as a shop's export of basket counts holds them, and
 * the items without their date added. Shared by the vitest journey and the Models screen's end-to-end check.
 */
export const ONLINE_RETAIL = path.resolve(import.meta.dirname, '../fixtures/online-retail');

function csv(file: string): Record<string, string>[] {
  return Papa.parse<Record<string, string>>(fs.readFileSync(file, 'utf8'), { header: true, skipEmptyLines: true }).data;
}

export function writeTimelessCopy(dir: string): { items: string; counts: string; pairs: number } {
  const items = path.join(dir, 'products.csv');
  fs.writeFileSync(items, Papa.unparse(csv(path.join(ONLINE_RETAIL, 'items.csv')).map(({ added: _, ...rest }) => rest)));
  const sums = new Map<string, number>();
  for (const r of csv(path.join(ONLINE_RETAIL, 'train.csv'))) {
    const key = `${r['customer']}\t${r['item']}`;
    sums.set(key, (sums.get(key) ?? 0) + Number(r['value']));
  }
  const counts = path.join(dir, 'basket-counts.csv');
  const rows = [...sums].map(([key, q]) => [...key.split('\t'), String(q)]);
  fs.writeFileSync(counts, Papa.unparse({ fields: ['customer_id', 'product', 'quantity'], data: rows }));
  return { items, counts, pairs: rows.length };
}
