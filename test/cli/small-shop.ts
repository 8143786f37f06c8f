import { generateDemoShop } from '../../demo-data/generator/index.ts';
import { importFile } from '../../src-main/services/import.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

/** A small generated shop (120 items, 400 customers, 5,000 signals) imported into a new workspace at `ws`. */
export async function importSmallShop(ws: string, outDir: string, seed: number): Promise<void> {
  const shop = await generateDemoShop({ seed, items: 120, customers: 400, signals: 5000, outDir });
  const db = openWorkspace(ws);
  try {
    for (const target of ['items', 'customers', 'signals'] as const) await importFile(db, { target, file: shop.files[target] });
  } finally {
    db.close();
  }
}
