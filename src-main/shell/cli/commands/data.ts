import fs from 'node:fs';
import type { ImportReport } from '../../../api/contracts/data.ts';
import { refuseDemoTarget } from '../../../services/demo.ts';
import { call } from '../call.ts';
import { followJob } from '../follow-job.ts';
import { EXIT, UsageError, type CliCommand } from '../command.ts';
import { plural } from '../../../core/util/plural.ts';
import { SIGNAL_KINDS, type SignalKind } from '../../../core/types.ts';
import { formatDate, formatNumber, table } from '../format.ts';


const TARGETS = ['items', 'customers', 'signals'] as const;
type Target = (typeof TARGETS)[number];

function parseMapping(pairs: string[]): Record<string, string> {
  const mapping: Record<string, string> = {};
  for (const pair of pairs) {
    const eq = pair.indexOf('=');
    if (eq <= 0 || eq === pair.length - 1) throw new UsageError(`--map wants FIELD=HEADER, got '${pair}'`);
    mapping[pair.slice(0, eq)] = pair.slice(eq + 1);
  }
  return mapping;
}

function printReport(r: ImportReport, out: (t: string) => void): void {
  const verdict = r.committed ? 'imported' : 'NOT imported: nothing was changed';
  out(`${r.file} (${r.format}${r.delimiter ? `, delimiter '${r.delimiter === '\t' ? '\\t' : r.delimiter}'` : ''}): ${verdict}`);
  out(
    `  ${plural(r.rows, 'row')}: ${formatNumber(r.added)} added, ${formatNumber(r.updated)} updated, ` +
      `${formatNumber(r.unchanged)} unchanged, ${formatNumber(r.rejected)} rejected` +
      (r.customersCreated ? `, ${plural(r.customersCreated, 'customer created', 'customers created')}` : '') +
      ` in ${(r.elapsedMs / 1000).toFixed(2)} s`,
  );
  const p = r.pictures;
  if (p) {
    const placeholders = p.missing + p.broken + p.remote + p.unread;
    out(
      `  pictures: ${formatNumber(p.ready)} of ${formatNumber(p.named)} shown (${formatNumber(p.made)} thumbnails made, ${formatNumber(p.reused)} already stored)` +
        (placeholders ? `, ${formatNumber(placeholders)} with a placeholder` : '') + (p.cleared ? `, ${formatNumber(p.cleared)} removed` : ''),
    );
  }
  for (const w of r.warnings) out(`  warning: ${w}`);
  for (const e of r.errors) out(`  ${e.message}`);
  if (r.errorCount > r.errors.length) out(`  ... and ${plural(r.errorCount - r.errors.length, 'more rejected row', 'more rejected rows')}`);
}

/** The request fields import.preview and import.run share, by the flag that fills each. */
const IMPORT_FIELDS = { map: 'mapping', 'mapping-file': 'mappingFile', format: 'format', delimiter: 'delimiter', 'date-order': 'dateOrder', kind: 'kind' };

export const importCommand: CliCommand = {
  name: 'import',
  summary: 'import items, customers or signals from CSV, JSON or JSON Lines',
  usage: ['items|customers|signals FILE [--map FIELD=HEADER ...] [--mapping-file F] [--date-order dmy|mdy] [--kind KIND] [--create-customers] [--accept-partial]'],
  options: {
    map: { type: 'string', multiple: true },
    'mapping-file': { type: 'string' },
    format: { type: 'string' },
    delimiter: { type: 'string' },
    'date-order': { type: 'string' },
    kind: { type: 'string' },
    'create-customers': { type: 'boolean', default: false },
    'accept-partial': { type: 'boolean', default: false },
    preview: { type: 'boolean', default: false },
  },
  flagFields: {
    'import.preview': IMPORT_FIELDS,
    'import.run': { ...IMPORT_FIELDS, 'create-customers': 'unknown', 'accept-partial': 'acceptPartial' },
    none: ['preview'],
  },
  about: {
    map: 'repeatable: FIELD=HEADER, read the field from that column (overrides detection)',
    'mapping-file': 'a JSON file {"field": "Header", ...}; --map entries override it',
    format: 'csv, json or jsonl (default: from the file extension)',
    delimiter: "one character (default: ',', ';' or tab, whichever the header line uses)",
    'date-order': 'dmy or mdy, for dates like 03/04/2026 (ISO 8601 dates need none)',
    kind: `signals: every row is this kind (${SIGNAL_KINDS.join(', ')}), for a file without a kind column; a file with one is refused`,
    'create-customers': 'signals: add customers the workspace does not know yet (default: reject the row)',
    'accept-partial': 'keep the valid rows when some are rejected (default: change nothing)',
    preview: 'show the detected mapping and the first rows; import nothing',
  },
  help: [
    'The whole file is one transaction: if any row is rejected nothing changes (unless --accept-partial),',
    'and every rejected row is reported as file:line:column: reason.',
    'Headers are matched to fields automatically (id, title, category, tags, customer, item, kind, value, at...);',
    '--map FIELD=HEADER overrides one. Day/month dates like 03/04/2026 need --date-order dmy or mdy.',
    'Signals naming an unknown customer are rejected unless --create-customers; unknown items always are.',
    'A signal file without a kind column (a shop\'s export of purchases: customer, item, count) takes --kind KIND,',
    'which every row gets; a file that has a kind column is refused with --kind (the column and the flag would disagree).',
    '--preview shows the detected mapping and the first rows without importing.',
    'Items may have an image column (image, picture, photo...): a picture file\'s path, relative to the imported',
    'file or absolute, or a file: address. Each is made into a small thumbnail kept in the workspace (once per',
    'distinct picture); a file over 20 MB rejects its row; a missing or unreadable one shows a placeholder and a',
    'warning. http(s) addresses are recorded but never fetched (Shelfwright does not go to the network): download',
    'the pictures and name the files instead.',
    '',
    'example: shelfwright import signals clicks.csv --map customer=reader_id --date-order dmy',
    'example: shelfwright import signals orders.csv --kind purchase',
    'example: shelfwright import items catalogue.csv --map image=photo_file',
  ].join('\n'),
  async run(env) {
    const [target, file, ...extra] = env.positionals;
    if (!target || !TARGETS.includes(target as Target)) throw new UsageError('first say what to import: items, customers or signals');
    if (!file) throw new UsageError(`give the file to import ${target} from`);
    if (extra.length) throw new UsageError(`unexpected argument '${extra[0]}'`);
    const v = env.values;
    const format = v['format'] as string | undefined;
    if (format !== undefined && !['csv', 'json', 'jsonl'].includes(format)) throw new UsageError(`--format must be csv, json or jsonl, got '${format}'`);
    const dateOrder = v['date-order'] as string | undefined;
    if (dateOrder !== undefined && dateOrder !== 'dmy' && dateOrder !== 'mdy') throw new UsageError(`--date-order must be dmy or mdy, got '${dateOrder}'`);
    const kind = v['kind'] as string | undefined;
    if (kind !== undefined && !(SIGNAL_KINDS as readonly string[]).includes(kind)) {
      throw new UsageError(`--kind must be one of ${SIGNAL_KINDS.join(', ')}, got '${kind}'`);
    }
    if (kind !== undefined && target !== 'signals') throw new UsageError(`--kind is for signals only, not ${target}`);
    const mapping = parseMapping((v['map'] as string[] | undefined) ?? []);
    const request = {
      file,
      target: target as Target,
      ...(format && { format: format as 'csv' | 'json' | 'jsonl' }),
      ...(v['delimiter'] !== undefined && { delimiter: v['delimiter'] as string }),
      ...(dateOrder && { dateOrder: dateOrder as 'dmy' | 'mdy' }),
      ...(kind && { kind: kind as SignalKind }),
      ...(Object.keys(mapping).length > 0 && { mapping }),
      ...(v['mapping-file'] !== undefined && { mappingFile: v['mapping-file'] as string }),
    };
    // A mistyped -w path would otherwise quietly start an empty workspace: say so (stderr keeps stdout the report's).
    if (!v['preview'] && !env.json && !fs.existsSync(env.workspace)) env.io.err(`no workspace at ${env.workspace} yet: creating a new one`);
    const { table: api } = env.api({ create: true });
    if (v['preview']) {
      const p = await call(api, 'import.preview', request);
      if (env.json) env.io.out(JSON.stringify(p, null, 2));
      else {
        env.io.out(`${file}: ${p.format}${p.delimiter ? `, delimiter '${p.delimiter}'` : ''}`);
        env.io.out(table(['field', 'header'], Object.entries(p.mapping)));
        if (p.extraColumns.length) env.io.out(`other columns: ${p.extraColumns.join(', ')}`);
        env.io.out(table(p.headers, p.sampleRows.slice(0, 5).map((r) => r.map((c) => (c.length > 30 ? `${c.slice(0, 29)}…` : c)))));
        for (const problem of p.problems) env.io.out(problem);
      }
      return p.problems.length ? EXIT.data : EXIT.ok;
    }
    const report = await call(api, 'import.run', {
      ...request,
      unknown: v['create-customers'] ? 'create' : 'reject',
      acceptPartial: v['accept-partial'] === true,
    });
    if (env.json) env.io.out(JSON.stringify(report, null, 2));
    else printReport(report, (t) => (report.committed ? env.io.out(t) : env.io.err(t)));
    return report.committed ? EXIT.ok : EXIT.data;
  },
};

export const statsCommand: CliCommand = {
  name: 'stats',
  summary: 'what the workspace holds: counts, dates, density, kinds, top categories, long tail',
  usage: ['[--json]'],
  options: {},
  flagFields: {},
  about: {},
  async run(env) {
    const { table: api } = env.api();
    const s = await call(api, 'workspace.stats', {});
    if (env.json) {
      env.io.out(JSON.stringify(s, null, 2));
      return EXIT.ok;
    }
    const pct = (x: number | null) => (x === null ? '–' : `${(100 * x).toFixed(1)}%`);
    const out = env.io.out;
    out(`workspace ${env.workspace}`);
    out(`  items      ${formatNumber(s.items)} (${formatNumber(s.availableItems)} available, ${formatNumber(s.promotedItems)} promoted, ${formatNumber(s.coldItems)} with no signals)`);
    out(`  customers  ${formatNumber(s.customers)}`);
    const span = s.signals > 0 && s.lastSignalAt === null ? 'none with a time' : `from ${formatDate(s.firstSignalAt)} to ${formatDate(s.lastSignalAt)}`;
    out(`  signals    ${formatNumber(s.signals)} ${span}`);
    out(`  density    ${(100 * s.density).toFixed(3)}% of customer-item pairs`);
    out(`  long tail  ${pct(s.longTailShare)} of signals go to items outside the most-interacted 20%`);
    out(`  last import ${s.lastImportAt === null ? 'never' : new Date(s.lastImportAt).toISOString().replace('T', ' ').slice(0, 16)}`);
    out('');
    out(table(['kind', 'signals'], Object.entries(s.signalsByKind).map(([k, n]) => [k, n]).sort((a, b) => Number(b[1]) - Number(a[1]))));
    out('');
    out(table(['top categories by items', 'items'], s.topCategoriesByItems.map((c) => [c.category || '(none)', c.items])));
    out('');
    out(table(['top categories by signals', 'signals'], s.topCategoriesBySignals.map((c) => [c.category || '(none)', c.signals])));
    return EXIT.ok;
  },
};

export const demoCommand: CliCommand = {
  name: 'demo',
  summary: 'rebuild the demo workspace (an invented garden-supply shop) and train its models',
  usage: ['[--workspace PATH] [--seed N] [--no-train]'],
  options: { seed: { type: 'string' }, 'no-train': { type: 'boolean', default: false } },
  flagFields: { 'workspace.demo': { seed: 'seed', 'no-train': 'train' } },
  about: {
    seed: 'a whole number >= 0: which invented shop to generate (default 7)',
    'no-train': 'only generate and import the shop; train no models',
  },
  help: 'Replaces the workspace file with a freshly generated demo shop. The same seed always gives the same shop.',
  async run(env) {
    const seedText = env.values['seed'] as string | undefined;
    const seed = seedText === undefined ? undefined : Number(seedText);
    if (seed !== undefined && !(Number.isInteger(seed) && seed >= 0)) throw new UsageError(`--seed must be a whole number >= 0, got '${seedText}'`);
    // Said before the job starts, so the refusal is a plain data error (code conflict), not a failed job.
    refuseDemoTarget(env.workspace);
    const { table: api } = env.api({ detached: true });
    const job = await call(api, 'workspace.demo', {
      file: env.workspace,
      train: env.values['no-train'] !== true,
      ...(seed !== undefined && { seed }),
    });
    const done = await followJob(api, job, env.io);
    if (env.json) env.io.out(JSON.stringify(done, null, 2));
    else env.io.out(`${done.summary}\nworkspace: ${env.workspace}`);
    return EXIT.ok;
  },
};
