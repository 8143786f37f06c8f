import { call } from '../call.ts';
import { EXIT, UsageError, type CliCommand } from '../command.ts';
import { num, str } from '../flags.ts';
import { formatNumber } from '../format.ts';

/** Training on a cluster, curating here (docs/cluster.md). Thin: flags → api calls → print. */

export const exportSignalsCommand: CliCommand = {
  name: 'export signals',
  summary: 'write the signals (kind weights, optional time decay) and an id map as Parquet, for training on a Spark cluster',
  usage: ['--format parquet --out DIR [--half-life DAYS] [--json]'],
  options: { format: { type: 'string' }, out: { type: 'string' }, 'half-life': { type: 'string' } },
  flagFields: { 'signals.export': { out: 'out', 'half-life': 'halfLifeDays' }, none: ['format'] },
  about: {
    format: 'parquet (the one format; required, so the command says what it writes)',
    out: 'a new (or empty) folder: signals/, customers/, items/ and shelfwright-export.json go into it',
    'half-life': 'decay each signal by 2^(-age/DAYS), age counted back from the newest signal (default: no decay)',
  },
  help: [
    'One row per customer and item with a positive sum: customer (int), item (int), rating (float), the same',
    'values our own iALS trains on. customers/ and items/ map the integers back to your ids.',
    'docs/cluster.md has the PySpark lines that read it, fit ALS(implicitPrefs=True, ...) and save the model.',
    '',
    'example: shelfwright export signals --format parquet --out /data/shop-2026-12',
  ].join('\n'),
  async run(env) {
    if (env.positionals.length) throw new UsageError(`unexpected argument '${env.positionals[0]}'`);
    const format = str(env, 'format');
    if (format !== 'parquet') throw new UsageError(format === undefined ? 'say --format parquet' : `--format must be parquet, got '${format}'`);
    const out = str(env, 'out');
    if (!out) throw new UsageError('give the folder to write with --out DIR');
    const halfLifeDays = num(env, 'half-life', (x) => x > 0, 'a number of days > 0');
    const { table } = env.api();
    const r = await call(table, 'signals.export', { out, ...(halfLifeDays !== undefined && { halfLifeDays }) });
    if (env.json) env.io.out(JSON.stringify(r, null, 2));
    else {
      env.io.out(`wrote ${formatNumber(r.signals)} signals of ${formatNumber(r.customers)} customers on ${formatNumber(r.items)} items into ${r.out}`);
      env.io.out(`next: fit ALS on the cluster as docs/cluster.md shows, save the model into ${r.out}/model, then: shelfwright import model ${r.out}/model`);
    }
    return EXIT.ok;
  },
};

export const importModelCommand: CliCommand = {
  name: 'import model',
  summary: "store a Spark ALS model folder (ALSModel.save) as the workspace's iALS model",
  usage: ['DIR [--ids EXPORT_DIR] [--json]'],
  options: { ids: { type: 'string' } },
  flagFields: { 'model.import': { ids: 'idsFolder' } },
  about: { ids: "the folder `export signals` wrote, holding the id map (default: DIR's parent folder)" },
  help: [
    'DIR is what model.save(DIR) wrote on the cluster: metadata/, userFactors/ and itemFactors/.',
    'Refused, with the file and row named and nothing changed: a folder that is not a saved model, a model',
    'of another kind, an explicit (implicitPrefs=false) fit, rows whose length is not the rank, ids missing',
    'from the id map, NaN or infinite factors, and a customer erased since the export.',
    '',
    'example: shelfwright import model /data/shop-2026-12/model',
  ].join('\n'),
  async run(env) {
    const [dir, ...extra] = env.positionals;
    if (!dir) throw new UsageError('give the model folder to import');
    if (extra.length) throw new UsageError(`unexpected argument '${extra[0]}'`);
    const ids = str(env, 'ids');
    const { table } = env.api();
    const r = await call(table, 'model.import', { dir, ...(ids !== undefined && { idsFolder: ids }) });
    if (env.json) env.io.out(JSON.stringify(r, null, 2));
    else {
      env.io.out(`imported the iALS model: ${r.origin.description}`);
      for (const note of r.notes.slice(1)) env.io.out(`  ${note}`);
    }
    return EXIT.ok;
  },
};
