import type { AppContext } from '../../services/context.ts';
import { describeOrigin } from '../../services/cluster/origin-words.ts';
import type { Handler } from '../handler-table.ts';

type Names = 'signals.export' | 'model.import';

/**
 * The Parquet reader and writer load only when a cluster command runs (dynamic imports), so every other
 * command starts without them (bench:cli).
 */
export function clusterHandlers(ctx: AppContext): { [M in Names]: Handler<M> } {
  return {
    'signals.export': async (req) => {
      const { exportSignals } = await import('../../services/cluster/export-signals.ts');
      const r = exportSignals(ctx.db, req.out, req.halfLifeDays !== undefined ? { halfLifeDays: req.halfLifeDays } : {});
      return { out: r.out, files: r.files, customers: r.manifest.customers, items: r.manifest.items, signals: r.manifest.signals, fingerprint: r.manifest.fingerprint };
    },
    'model.import': async (req) => {
      const { importModel } = await import('../../services/cluster/import-model.ts');
      const { timings: _timings, ...r } = await importModel(ctx.db, req.dir, req.idsFolder !== undefined ? { ids: req.idsFolder } : {});
      return { ...r, origin: { ...r.origin, description: describeOrigin(r.origin) } };
    },
  };
}
