import type { AppContext } from '../../services/context.ts';
import { exportSignals } from '../../services/cluster/export-signals.ts';
import { describeOrigin, importModel } from '../../services/cluster/import-model.ts';
import type { Handler } from '../handler-table.ts';

type Names = 'signals.export' | 'model.import';

export function clusterHandlers(ctx: AppContext): { [M in Names]: Handler<M> } {
  return {
    'signals.export': (req) => {
      const r = exportSignals(ctx.db, req.out, req.halfLifeDays !== undefined ? { halfLifeDays: req.halfLifeDays } : {});
      return { out: r.out, files: r.files, customers: r.manifest.customers, items: r.manifest.items, signals: r.manifest.signals, fingerprint: r.manifest.fingerprint };
    },
    'model.import': async (req) => {
      const { timings: _timings, ...r } = await importModel(ctx.db, req.dir, req.idsFolder !== undefined ? { ids: req.idsFolder } : {});
      return { ...r, origin: { ...r.origin, description: describeOrigin(r.origin) } };
    },
  };
}
