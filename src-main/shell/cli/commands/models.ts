import { plural } from '../../../core/util/plural.ts';
import { reasonWords } from '../../../core/curation/reason-words.ts';
import type { ResponseOf } from '../../../api/contract.ts';
import { call, CliApiError } from '../call.ts';
import { EXIT, type CliCommand, type CommandEnv } from '../command.ts';
import { int, list, num, str } from '../flags.ts';
import { followJob } from '../follow-job.ts';
import { formatNumber, table } from '../format.ts';
import { UsageError } from '../command.ts';
import { TUNE_BUDGET } from '../../../core/models/tune-budget.ts';
import { SPLIT_CHOICES, SPLIT_CHOICE_WORDS, type SplitChoice } from '../../../core/eval/split-choice.ts';

/** Training, evaluation, neighbours, ad-hoc proposals and the top-N export. Thin: flags → api calls → print. */

const nonNeg = (env: CommandEnv, name: string) => num(env, name, (x) => x >= 0, 'a number >= 0');
const val = (x: number | null | undefined) => (x === null || x === undefined ? '–' : formatNumber(x));
const only = <T extends object>(o: T) => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;

const MODEL_KINDS = ['content', 'itemknn', 'ials', 'ease', 'popularity'] as const;

/** A value transform flag (presence, log, linear), refused by name otherwise. */
function transform(env: CommandEnv, name: string): 'presence' | 'log' | 'linear' | undefined {
  const v = str(env, name);
  if (v !== undefined && v !== 'presence' && v !== 'log' && v !== 'linear') throw new UsageError(`--${name} must be presence, log or linear, got '${v}'`);
  return v;
}

/** A half-life flag: a number of days > 0, or `off` (null: no decay). */
function halfLife(env: CommandEnv, name: string): number | null | undefined {
  const v = str(env, name);
  if (v === undefined) return undefined;
  if (v.trim() === 'off') return null;
  const x = Number(v);
  if (v.trim() === '' || !Number.isFinite(x) || !(x > 0)) throw new UsageError(`--${name} must be a number of days > 0 or off, got '${v}'`);
  return x;
}

/** "fit 180 d, profile off" from a model's stored parameters; '–' when it has no recency parameters. */
export function recencyCell(params: Record<string, unknown>): string {
  const f = params['fitHalfLifeDays'];
  const p = params['profileHalfLifeDays'];
  if (f === undefined && p === undefined) return '–';
  const one = (h: unknown) => (typeof h === 'number' ? `${h} d` : 'off');
  if (typeof f !== 'number' && typeof p !== 'number') return 'off';
  // Popularity has only a fit side and content only a profile side: say the side the model has.
  if (p === undefined) return `fit ${one(f)}`;
  if (f === undefined) return `profile ${one(p)}`;
  return `fit ${one(f)}, profile ${one(p)}`;
}

type StoredModel = ResponseOf<'models.list'>['models'][number];

/**
 * The "tuned" column of `train`: the settings the model was trained with and the grid's best NDCG. With
 * --tune a flag's value is held fixed during the search (train.start passes it to the tuner), so it is the
 * grid's best by construction and shown as "fixed by you"; a model whose every grid setting was fixed was
 * not searched. `given` are this run's flags, which apply only to the models this run trained.
 */
function tunedCell(m: StoredModel, given: Record<string, Record<string, unknown>> | null, omit: readonly string[] = []): string {
  const t = m.tuning;
  if (!t) return '';
  const shown = Object.fromEntries(Object.entries(t.grid.best).filter(([param]) => !omit.includes(param)));
  const ndcg = `NDCG@${t.k} ${val(t.grid.ndcg)}`;
  // A content model tuned before the validated blend carries the retired content-weight grid.
  if (t.grid.model === 'hybrid') return `hybrid ${Object.entries(shown).map(([a, b]) => `${a}=${b}`).join(' ')} (${ndcg})`;
  if (t.grid.trials.length === 0) return `${Object.entries(shown).map(([a, b]) => `${a}=${b}`).join(' ')} (fixed by you: not searched)`;
  let differs = false;
  const parts = Object.entries(shown).map(([param, best]) => {
    const used = m.params[param];
    // Trained with a value the grid did not hold (a model tuned before fixed values were searched with).
    if ((typeof used === 'number' || typeof used === 'string') && used !== best) {
      differs = true;
      return `${param}=${used} (set by hand; the grid's best was ${best})`;
    }
    return given?.[m.kind]?.[param] === best ? `${param}=${best} (fixed by you)` : `${param}=${best}`;
  });
  return `${parts.join(' ')} (${differs ? `the grid's best scored ${ndcg}` : ndcg})`;
}

/**
 * train.start's `tune`: left out when no tuning flag is given, so the api's default decides (the app's Train
 * button sends the same request); `false` with --no-tune; with --tune or a tuning flag, those values over the
 * default's "when the data changed".
 */
function tuneRequest(noTune: boolean, always: boolean, o: { k: number | undefined; seed: number | undefined; budget: number | undefined }) {
  if (noTune) return false as const;
  const given = only(o);
  if (!always && Object.keys(given).length === 0) return undefined;
  return { ...given, when: always ? ('always' as const) : ('changed' as const) };
}

const trainCommand: CliCommand = {
  name: 'train',
  summary: 'train the models (progress on stderr, a summary at the end); --tune searches each model\'s grid first',
  usage: ['[--models content,itemknn,ials,ease,popularity] [--factors N] [--iterations N] [--tune | --no-tune] [--budget B] [--k K] [--json]'],
  options: {
    models: { type: 'string' },
    factors: { type: 'string' },
    iterations: { type: 'string' },
    regularization: { type: 'string' },
    alpha: { type: 'string' },
    scaling: { type: 'string' },
    neighbours: { type: 'string' },
    shrink: { type: 'string' },
    lambda: { type: 'string' },
    'knn-values': { type: 'string' },
    'knn-normalize': { type: 'string' },
    'ease-values': { type: 'string' },
    'knn-fit-half-life': { type: 'string' },
    'knn-profile-half-life': { type: 'string' },
    'ease-fit-half-life': { type: 'string' },
    'ease-profile-half-life': { type: 'string' },
    'popularity-half-life': { type: 'string' },
    'content-profile-half-life': { type: 'string' },
    threads: { type: 'string' },
    seed: { type: 'string' },
    tune: { type: 'boolean', default: false },
    'no-tune': { type: 'boolean', default: false },
    budget: { type: 'string' },
    k: { type: 'string' },
  },
  // One line per flag: the train.start field it fills (flag-fields.ts).
  flagFields: {
    'train.start': {
      models: 'models',
      factors: 'ials.factors',
      iterations: 'ials.iterations',
      regularization: 'ials.regularization',
      alpha: 'ials.alpha',
      scaling: 'ials.scaling',
      neighbours: 'itemknn.k',
      shrink: 'itemknn.shrink',
      lambda: 'ease.lambda',
      'knn-values': 'itemknn.values',
      'knn-normalize': 'itemknn.normalize',
      'ease-values': 'ease.values',
      'knn-fit-half-life': 'itemknn.fitHalfLifeDays',
      'knn-profile-half-life': 'itemknn.profileHalfLifeDays',
      'ease-fit-half-life': 'ease.fitHalfLifeDays',
      'ease-profile-half-life': 'ease.profileHalfLifeDays',
      'popularity-half-life': 'popularity.fitHalfLifeDays',
      'content-profile-half-life': 'content.profileHalfLifeDays',
      threads: 'threads',
      seed: ['ials.seed', 'tune.seed'],
      budget: 'tune.budget',
      k: 'tune.k',
    },
    none: ['tune', 'no-tune'],
  },
  about: {
    models: 'comma-separated: content, itemknn, ials, ease, popularity (default all five)',
    factors: 'iALS: size of the taste vectors, 1 to 1024 (default 64)',
    iterations: 'iALS: training sweeps over customers and items (default 15)',
    regularization: 'iALS: how strongly large factors are held back, >= 0 (default 0.01; λ of Hu et al. eq. 3, unscaled; tuning searches 0.01 to 1000)',
    alpha: 'iALS: how much more a repeated signal counts, >= 0 (default 1)',
    scaling: 'iALS: confidence grows linear or log with the signal (default linear)',
    neighbours: 'item-kNN: similar items kept per item (default 50)',
    shrink: 'item-kNN: damping of similarities built on few customers, >= 0 (default 10)',
    lambda: "the EASE model's regularisation, above 0 (default 500)",
    'knn-values': 'item-kNN: how a customer\'s summed signals on an item count: presence, log or linear (default presence)',
    'knn-normalize': 'item-kNN: none, or sum (each history item\'s neighbour similarities sum to 1 in scoring; Deshpande & Karypis 2004) (default none)',
    'ease-values': 'EASE: how a customer\'s summed signals on an item count: presence, log or linear (default presence)',
    'knn-fit-half-life': 'item-kNN: recency of what similarities are learnt from: an entry N days old weighs 2^(-age/N); days > 0 or off',
    'knn-profile-half-life': 'item-kNN: recency of the customer\'s own items when scoring them, as above; days > 0 or off',
    'ease-fit-half-life': 'EASE: recency of the entries its weights are fitted on, as for item-kNN; days > 0 or off',
    'ease-profile-half-life': 'EASE: recency of the customer\'s own items when scoring them; days > 0 or off',
    'popularity-half-life': 'popularity: recent popularity, each customer counted 2^(-age/N); days > 0 or off (default off, not searched)',
    'content-profile-half-life': 'content: recency of the customer\'s own items in their text profile; days > 0 or off',
    threads: "threads to train with, 1 to 8 (default the machine's cores, at most 8)",
    seed: 'random seed for iALS and, with --tune, the validation split (default 1)',
    tune: "search each model's grid first even when the data is unchanged since the last tuning",
    'no-tune': 'train the defaults and your flags as they are, with no search',
    budget: `what the search may spend, in plain fits of all models, ${TUNE_BUDGET.min} to ${TUNE_BUDGET.max} (default ${TUNE_BUDGET.default})`,
    k: 'the list length the grids are judged on, NDCG@K (default 10)',
  },
  help: [
    'iALS: --factors, --iterations, --regularization, --alpha, --scaling linear|log (confidence 1+a*r or 1+a*log(1+r)), --seed',
    'item-kNN: --neighbours, --shrink, --knn-values, --knn-normalize.  EASE: --lambda, --ease-values.',
    'Values: the signals of one customer on one item are summed (each weighed by its kind), then',
    'the sum enters as presence (1), log (log(1+v)) or linear (v).',
    'Recency (item-kNN and EASE, --*-fit-half-life, --*-profile-half-life; --popularity-half-life,',
    '--content-profile-half-life): that value times 2^(-age/half-life),',
    'age = days since the pair\'s latest signal; "fit" decays what the model learns from, "profile" the customer\'s',
    'items it scores from. Off by default; tuning searches off, 730, 180, 45, 11 days when the signals have times.',
    'Tuning (by default, when the data changed since the last tuning; --tune always; --no-tune never): a seeded',
    'validation split (by time when the signals have times, else per customer at random), a coordinate search over',
    'each model\'s log grid judged by NDCG@K (--k, default 10) within --budget plain fits, the best refitted on all',
    'signals and stored with what was searched. Unchanged data trains the last tuning\'s settings again.',
    'Above the default budget, iALS\'s best third of settings (tried at 3 sweeps) is refitted with all sweeps and',
    'chosen by that score (successive halving).',
    'A setting given as a flag (e.g. --factors 32) is held fixed while the rest of that model\'s grid is searched;',
    'a model with every grid setting given (e.g. EASE with --lambda and --ease-values) is not searched.',
  ].join('\n'),
  async run(env) {
    const models = str(env, 'models')?.split(',').map((m) => m.trim()).filter(Boolean);
    if (models !== undefined) {
      const unknown = models.filter((m) => !MODEL_KINDS.includes(m as (typeof MODEL_KINDS)[number]));
      if (models.length === 0 || unknown.length) {
        throw new UsageError(`--models takes a comma-separated list of ${MODEL_KINDS.join(', ')}${unknown.length ? `; '${unknown[0]}' is not one of them` : ''}`);
      }
    }
    const scaling = str(env, 'scaling');
    if (scaling !== undefined && scaling !== 'linear' && scaling !== 'log') throw new UsageError(`--scaling must be linear or log, got '${scaling}'`);
    const ials = only({
      factors: int(env, 'factors'),
      iterations: int(env, 'iterations'),
      regularization: nonNeg(env, 'regularization'),
      alpha: nonNeg(env, 'alpha'),
      scaling: scaling as 'linear' | 'log' | undefined,
      seed: int(env, 'seed', 0),
    });
    const normalize = str(env, 'knn-normalize');
    if (normalize !== undefined && normalize !== 'none' && normalize !== 'sum') throw new UsageError(`--knn-normalize must be none or sum, got '${normalize}'`);
    const itemknn = only({
      k: int(env, 'neighbours'),
      shrink: nonNeg(env, 'shrink'),
      values: transform(env, 'knn-values'),
      normalize: normalize as 'none' | 'sum' | undefined,
      fitHalfLifeDays: halfLife(env, 'knn-fit-half-life'),
      profileHalfLifeDays: halfLife(env, 'knn-profile-half-life'),
    });
    const lambda = num(env, 'lambda', (x) => x > 0, 'a number > 0');
    const ease = only({
      lambda,
      values: transform(env, 'ease-values'),
      fitHalfLifeDays: halfLife(env, 'ease-fit-half-life'),
      profileHalfLifeDays: halfLife(env, 'ease-profile-half-life'),
    });
    const popularity = only({ fitHalfLifeDays: halfLife(env, 'popularity-half-life') });
    const content = only({ profileHalfLifeDays: halfLife(env, 'content-profile-half-life') });
    const k = int(env, 'k');
    const noTune = env.values['no-tune'] === true;
    if (noTune && env.values['tune']) throw new UsageError('give --tune or --no-tune, not both');
    if (k !== undefined && noTune) throw new UsageError('--k sets the tuning cut-off; it does nothing with --no-tune');
    const budget = num(env, 'budget', (x) => x >= TUNE_BUDGET.min && x <= TUNE_BUDGET.max, `a number of plain fits from ${TUNE_BUDGET.min} to ${TUNE_BUDGET.max}`);
    if (budget !== undefined && noTune) throw new UsageError('--budget sets what tuning may spend; it does nothing with --no-tune');
    const { table: t } = env.api();
    const job = await call(t, 'train.start', only({
      models: models as ('content' | 'itemknn' | 'ials' | 'ease' | 'popularity')[] | undefined,
      ials: Object.keys(ials).length ? ials : undefined,
      itemknn: Object.keys(itemknn).length ? itemknn : undefined,
      ease: Object.keys(ease).length ? ease : undefined,
      popularity: Object.keys(popularity).length ? popularity : undefined,
      content: Object.keys(content).length ? content : undefined,
      threads: int(env, 'threads'),
      tune: tuneRequest(noTune, env.values['tune'] === true, { k, seed: int(env, 'seed', 0), budget }),
    }));
    const end = await followJob(t, job, env.io);
    const { models: stored, hybrid } = await call(t, 'models.list', {});
    if (env.json) {
      env.io.out(JSON.stringify({ job: end, models: stored, hybrid }, null, 2));
      return EXIT.ok;
    }
    const given: Record<string, Record<string, unknown>> = { ials, itemknn, ease };
    const trained = (kind: string) => models === undefined || models.includes(kind);
    const rows = stored.map((m) => [
      m.kind,
      m.trainMs / 1000,
      m.iterations ?? '–',
      m.losses.length ? (m.losses.at(-1) as number) : '–',
      tunedCell(m, trained(m.kind) ? given : null),
      m.notes.join('; '),
    ]);
    // What each search covered, for the models this run tuned (a tuning carried over from unchanged data included).
    const searched = stored
      .filter((m) => trained(m.kind) && m.tuning?.grid.search)
      .map((m) => {
        const g = m.tuning!.grid;
        const axes = Object.entries(g.search!.axes).map(([a, v]) => `${a} ${v.join('/')}`).join('; ');
        return `${m.kind}: ${plural(g.trials.length, 'setting')} tried over ${axes} (${g.search!.stopped === 'budget' ? 'budget spent' : 'no step improved'})`;
      });
    const hybridText = hybridLines(hybrid).filter((l) => !(end.summary ?? '').includes(l.slice('hybrid: '.length))).join('\n');
    const tunerNotes = tuningNoteLines(stored.filter((m) => trained(m.kind)));
    env.io.out(
      `${end.summary ?? 'done'}\n${table(['model', 'seconds', 'iterations', 'final loss', 'tuned', 'notes'], rows)}` +
        `${searched.length ? `\nsearched:\n${searched.join('\n')}` : ''}${tunerNotes.length ? `\n${tunerNotes.join('\n')}` : ''}\n${hybridText}`,
    );
    return EXIT.ok;
  },
};

/** The tuner's notes, for under a table (too long for a cell): "tuning notes:", then one line per note with its model. */
function tuningNoteLines(models: readonly StoredModel[]): string[] {
  const notes = models.flatMap((m) => m.tuningNotes.map((n) => `  ${m.kind}: ${n}`));
  return notes.length ? ['tuning notes:', ...notes] : [];
}

/** "hybrid: ..." — what the hybrid is, and how each model scored alone on validation. */
function hybridLines(h: ResponseOf<'models.list'>['hybrid']): string[] {
  if (!h) return ['hybrid: no validated blend stored yet (train to learn one)'];
  const singles = h.validation.singles.map((x) => `${x.model} ${val(x.ndcg)}`).join(', ');
  return [
    `hybrid: ${h.reason}${h.stale ? ' (the data changed since: retrain)' : ''}`,
    `validation (${h.validation.method ?? '–'} split, ${plural(h.validation.customers, 'customer')}), NDCG@${h.validation.k} alone: ${singles || '–'}`,
  ];
}

const modelsCommand: CliCommand = {
  name: 'models',
  summary: 'the current models, and what the hybrid is (the validated blend, or the single model it is)',
  usage: ['[--json]'],
  options: {},
  flagFields: {},
  about: {},
  async run(env) {
    if (env.positionals.length) throw new UsageError(`unexpected argument '${env.positionals[0]}'`);
    const { table: t } = env.api();
    const r = await call(t, 'models.list', {});
    if (env.json) {
      env.io.out(JSON.stringify(r, null, 2));
      return EXIT.ok;
    }
    const rows = r.models.map((m) => [
      m.kind,
      new Date(m.trainedAt).toISOString().slice(0, 16).replace('T', ' '),
      m.trainMs / 1000,
      m.stale ? (m.origin ? "stale: the workspace's data changed since the export" : 'stale: retrain') : 'current',
      m.evaluation ? val(m.evaluation.ndcg) : '–',
      // The half-lives have a column of their own here.
      tunedCell(m, null, ['fitHalfLifeDays', 'profileHalfLifeDays']) || (m.tuningNotes.length ? 'not tuned' : '–'),
      recencyCell(m.params),
    ]);
    // A model trained elsewhere says where (docs/cluster.md).
    const origins = r.models.filter((m) => m.origin).map((m) => `${m.kind}: ${m.origin!.description}`);
    const notes = tuningNoteLines(r.models);
    env.io.out(
      [
        r.models.length
          ? table(['model', 'trained (UTC)', 'seconds', 'status', 'NDCG (evaluate)', 'tuned', 'recency half-life'], rows)
          : 'no trained models',
        ...notes,
        ...origins,
        ...hybridLines(r.hybrid),
      ].join('\n'),
    );
    return EXIT.ok;
  },
};

type Row = ResponseOf<'evaluate.latest'>['evaluation'] extends infer E ? (E extends { rows: (infer R)[] } ? R : never) : never;

function metricsTable(rows: Row[], k: number, extra: (r: Row) => (string | number)[] = () => [], extraHead: string[] = []): string {
  return table(
    ['model', `Recall@${k}`, `Precision@${k}`, `NDCG@${k}`, `MAP@${k}`, `HitRate@${k}`, 'coverage', 'novelty', 'customers', ...extraHead],
    rows.map((r) => [r.model, val(r.recall), val(r.precision), val(r.ndcg), val(r.map), val(r.hitRate), val(r.coverage), val(r.novelty), r.customers, ...extra(r)]),
  );
}

const evaluateCommand: CliCommand = {
  name: 'evaluate',
  summary: 'evaluate every model against baselines on a held-out split (by time, or per customer when signals have no times), or against your own holdout file (--holdout)',
  usage: [
    '[--k K] [--sample N] [--split auto|time|random] [--json]',
    '--holdout FILE [--k K] [--map FIELD=HEADER ...] [--format csv|jsonl|json] [--delimiter C] [--date-order dmy|mdy] [--per-customer] [--json]',
  ],
  options: {
    k: { type: 'string' },
    sample: { type: 'string' },
    split: { type: 'string' },
    holdout: { type: 'string' },
    map: { type: 'string', multiple: true },
    format: { type: 'string' },
    delimiter: { type: 'string' },
    'date-order': { type: 'string' },
    'per-customer': { type: 'boolean' },
  },
  flagFields: {
    'evaluate.start': { k: 'k', sample: 'sampleCustomers', split: 'split' },
    'evaluate.holdout': { k: 'k', holdout: 'source.file', map: 'mapping', format: 'format', delimiter: 'delimiter', 'date-order': 'dateOrder', 'per-customer': 'perCustomer' },
  },
  about: {
    k: 'list length scored: 1 to 200 (default 10), with --holdout 1 to 500 (default 20)',
    sample: 'most customers measured per window (default 2000); not used with --holdout',
    split: `how to hold out: auto (default: ${SPLIT_CHOICE_WORDS.auto}), time (${SPLIT_CHOICE_WORDS.time}), random (${SPLIT_CHOICE_WORDS.random})`,
    holdout: 'score the models against the customer and item pairs in this file instead',
    map: 'repeatable, with --holdout: FIELD=HEADER, read FIELD from column HEADER',
    format: 'with --holdout: csv, json or jsonl (default: from the file extension)',
    delimiter: 'with --holdout: the CSV column separator, one character (default: detected)',
    'date-order': 'with --holdout: dmy or mdy, for dates like 03/04/2026 in the file (ISO 8601 dates need none)',
    'per-customer': 'with --holdout --json: also each customer\'s NDCG@K per model (for paired comparisons)',
  },
  help: [
    'Recall@K divides by min(K, |held-out items|) (Liang et al. 2018); NDCG@K is binary with a log2 discount.',
    'Holdout file: customer, item, optional value and time, headers matched as for a signal import;',
    '--map customer=User maps a column by hand; day/month dates like 03/04/2026 need --date-order dmy or mdy.',
    'Unknown customers and items are counted and reported.',
  ].join('\n'),
  async run(env) {
    const holdout = str(env, 'holdout');
    if (holdout === '') throw new UsageError('--holdout takes a FILE');
    // Each flag belongs to one of the two modes; one given to the other would be silently ignored.
    if (holdout !== undefined && env.values['sample'] !== undefined) {
      throw new UsageError('--sample only works without --holdout (a holdout file is scored on all its customers)');
    }
    if (holdout !== undefined && env.values['split'] !== undefined) {
      throw new UsageError('--split only works without --holdout (a holdout file is its own split)');
    }
    const split = str(env, 'split');
    if (split !== undefined && !(SPLIT_CHOICES as readonly string[]).includes(split)) throw new UsageError(`--split must be ${SPLIT_CHOICES.join(', ')}, got '${split}'`);
    if (holdout === undefined) {
      const holdoutOnly = ['map', 'format', 'delimiter', 'date-order', 'per-customer'].find((f) => env.values[f] !== undefined);
      if (holdoutOnly) throw new UsageError(`--${holdoutOnly} only works with --holdout FILE`);
    }
    const maxK = holdout ? 500 : 200; // the api's bounds for evaluate.holdout and evaluate.start
    const k = num(env, 'k', (x) => Number.isInteger(x) && x >= 1 && x <= maxK, `a whole number from 1 to ${maxK}`);
    const { table: t } = env.api();
    if (holdout) {
      const mapping: Record<string, string> = {};
      for (const m of list(env, 'map')) {
        const eq = m.indexOf('=');
        if (eq <= 0) throw new UsageError(`--map takes FIELD=HEADER, got '${m}'`);
        mapping[m.slice(0, eq).trim()] = m.slice(eq + 1).trim();
      }
      const format = str(env, 'format');
      if (format !== undefined && !['csv', 'json', 'jsonl'].includes(format)) throw new UsageError(`--format must be csv, json or jsonl, got '${format}'`);
      const dateOrder = str(env, 'date-order');
      if (dateOrder !== undefined && dateOrder !== 'dmy' && dateOrder !== 'mdy') throw new UsageError(`--date-order must be dmy or mdy, got '${dateOrder}'`);
      const r = await call(t, 'evaluate.holdout', only({
        source: { file: holdout },
        k: k ?? 20,
        mapping: Object.keys(mapping).length ? mapping : undefined,
        format: format as 'csv' | 'json' | 'jsonl' | undefined,
        delimiter: str(env, 'delimiter'),
        dateOrder: dateOrder as 'dmy' | 'mdy' | undefined,
        perCustomer: env.values['per-customer'] === true ? true : undefined,
      }));
      if (env.json) {
        env.io.out(JSON.stringify(r, null, 2));
        return EXIT.ok;
      }
      const unk = (what: string, u: typeof r.unknownCustomers) =>
        u.distinct ? `${plural(u.distinct, `unknown ${what}`)} (${plural(u.rows, 'row')}), e.g. ${u.examples.join(', ')}` : `no unknown ${what}s`;
      env.io.out(
        [
          `${r.file}: ${plural(r.rows, 'row')}, ${plural(r.pairs, 'held-out pair')}, ${plural(r.customers, 'customer')} evaluated at K=${r.k}`,
          `${unk('customer', r.unknownCustomers)}; ${unk('item', r.unknownItems)}`,
          `${plural(r.alreadyInWorkspace, 'pair')} already in the workspace, ${plural(r.duplicateRows, 'duplicate row')}, ` +
            `${plural(r.customersWithoutNewItems, 'customer')} with nothing new, ${plural(r.coldCustomers, 'customer')} with no history`,
          r.models.some((m) => m.stale)
            ? metricsTable(r.models, r.k, (m) => [(m as { stale?: boolean | null }).stale ? 'stale: retrain' : ''], ['model data'])
            : metricsTable(r.models, r.k),
          `hybrid: ${r.weightsFrom}`,
          ...r.notes,
        ].join('\n'),
      );
      return EXIT.ok;
    }
    const job = await call(t, 'evaluate.start', only({ k: k ?? 10, sampleCustomers: int(env, 'sample'), split: split as SplitChoice | undefined })).catch((e: unknown) => {
      // A split the workspace's signals cannot support is a wrong command line, not bad data: said as --split.
      if (e instanceof CliApiError && e.error.where?.column === 'split') throw new UsageError(`--split time: ${e.error.message} (--split random, or leave --split out)`);
      throw e;
    });
    await followJob(t, job, env.io);
    const { evaluation: e } = await call(t, 'evaluate.latest', {});
    if (!e) throw new CliApiError({ code: 'internal', message: 'the evaluation stored nothing' });
    if (env.json) {
      env.io.out(JSON.stringify(e, null, 2));
      return EXIT.ok;
    }
    const w = Object.entries(e.weights).map(([a, b]) => `${a} ${formatNumber(b)}`).join(', ');
    const hybrid = e.hybrid ?? `weights ${w}`;
    const splitLine = `split: ${e.split.why ?? 'by time'}; ${e.split.train} train, ${e.split.validation} validation, ${e.split.test} test signals`;
    env.io.out(`${metricsTable(e.rows, e.k)}\n${splitLine}\nhybrid: ${hybrid}${e.notes.length ? `\n${e.notes.join('\n')}` : ''}`);
    return EXIT.ok;
  },
};

const similarCommand: CliCommand = {
  name: 'similar',
  summary: 'the items most like ITEM, with content and collaborative similarity for each',
  usage: ['ITEM [--n N] [--json]'],
  options: { n: { type: 'string' } },
  flagFields: { 'item.similar': { n: 'n' } },
  about: { n: 'how many similar items to list, 1 to 200 (default 10)' },
  async run(env) {
    if (env.positionals.length !== 1) throw new UsageError(env.positionals.length ? `unexpected argument '${env.positionals[1]}'` : 'missing ITEM');
    const { table: t } = env.api();
    const n = num(env, 'n', (x) => Number.isInteger(x) && x >= 1 && x <= 200, 'a whole number from 1 to 200') ?? 10;
    const r = await call(t, 'item.similar', { item: env.positionals[0]!, n });
    if (env.json) {
      env.io.out(JSON.stringify(r, null, 2));
      return EXIT.ok;
    }
    const rows = r.neighbours.map((x, q) => [q + 1, x.item, x.title, x.category, val(x.score), val(x.content), val(x.collaborative), x.mainReason, flags(x.coldStart, x.promoted)]);
    env.io.out(`${r.item.item}  ${r.item.title} (${r.item.category})\n${table(['#', 'item', 'title', 'category', 'score', 'content', 'collaborative', 'mostly', 'notes'], rows)}${r.notes.length ? `\n${r.notes.join('\n')}` : ''}`);
    return EXIT.ok;
  },
};

const proposeCommand: CliCommand = {
  name: 'propose',
  summary: 'a ranked, explained pool for an ad-hoc brief given by flags',
  usage: ['[--anchor ITEM ...] [--category C ...] [--exclude-category C ...] [--tag T ...] [--supplier S ...] [--min-price P] [--max-price P] [--max-age-days D] [--n N] [--date YYYY-MM-DD] [--json]'],
  options: {
    anchor: { type: 'string', multiple: true },
    category: { type: 'string', multiple: true },
    'exclude-category': { type: 'string', multiple: true },
    tag: { type: 'string', multiple: true },
    supplier: { type: 'string', multiple: true },
    'min-price': { type: 'string' },
    'max-price': { type: 'string' },
    'max-age-days': { type: 'string' },
    n: { type: 'string' },
    date: { type: 'string' },
  },
  flagFields: {
    propose: {
      anchor: 'anchors',
      category: 'categories',
      'exclude-category': 'excludeCategories',
      tag: 'tags',
      supplier: 'suppliers',
      'min-price': 'minPrice',
      'max-price': 'maxPrice',
      'max-age-days': 'maxAgeDays',
      n: 'n',
      date: 'date',
    },
  },
  about: {
    anchor: 'repeatable: an item id to build the pool around',
    category: 'repeatable: only items of this category (default every category)',
    'exclude-category': 'repeatable: leave out items of this category',
    tag: 'repeatable: only items with this tag (any of those given)',
    supplier: 'repeatable: only items from this supplier (any of those given)',
    'min-price': 'lowest price, >= 0; items without a price are then left out',
    'max-price': 'highest price, >= 0; items without a price are then left out',
    'max-age-days': 'only items added within this many days of --date (default any age)',
    n: 'how many items to list, 1 to 500 (default 20)',
    date: 'the day to rank for, YYYY-MM-DD (default today)',
  },
  async run(env) {
    if (env.positionals.length) throw new UsageError(`unexpected argument '${env.positionals[0]}'`);
    const { table: t } = env.api();
    const r = await call(t, 'propose', only({
      anchors: list(env, 'anchor'),
      categories: list(env, 'category'),
      excludeCategories: list(env, 'exclude-category'),
      tags: list(env, 'tag'),
      suppliers: list(env, 'supplier'),
      minPrice: nonNeg(env, 'min-price'),
      maxPrice: nonNeg(env, 'max-price'),
      maxAgeDays: nonNeg(env, 'max-age-days'),
      n: int(env, 'n') ?? 20,
      date: str(env, 'date'),
    }));
    if (env.json) {
      env.io.out(JSON.stringify(r, null, 2));
      return EXIT.ok;
    }
    // The main reason in words first (as the app says it), then the parts of the score that weighed most.
    const parts = (c: Record<string, number>) =>
      Object.entries(c).filter(([, v]) => v > 0).sort((a, b) => b[1] - a[1]).slice(0, 3).map(([k, v]) => `${k} ${formatNumber(v)}`).join(', ');
    const rows = r.items.map((x) => [x.rank, x.item, x.title, x.category, x.reason ? reasonWords(x.reason, { count: formatNumber }) : '–', parts(x.contributions), flags(x.coldStart, x.sponsored)]);
    env.io.out(`pool of ${formatNumber(r.poolSize)} on ${r.date}\n${table(['rank', 'item', 'title', 'category', 'why', 'parts', 'notes'], rows)}${r.notes.length ? `\n${r.notes.join('\n')}` : ''}`);
    return EXIT.ok;
  },
};

/** The notes column of a ranked list: "cold start" (scored by content, too few customers), "Sponsored". */
function flags(coldStart: boolean, sponsored: boolean): string {
  return [coldStart ? 'cold start' : '', sponsored ? 'Sponsored' : ''].filter(Boolean).join(', ');
}

const recommendCommand: CliCommand = {
  name: 'recommend',
  summary: "write each customer's top-N (CSV or JSON Lines) with per-component contributions",
  usage: ['(--customers FILE | --all) --top N --out FILE [--format csv|jsonl] [--json]'],
  options: { customers: { type: 'string' }, all: { type: 'boolean', default: false }, top: { type: 'string' }, out: { type: 'string' }, format: { type: 'string' } },
  flagFields: { recommend: { customers: 'customersFile', all: 'all', top: 'n', out: 'out', format: 'format' } },
  about: {
    customers: 'a file of customer ids, one a line (use this or --all)',
    all: 'every customer in the workspace (use this or --customers)',
    top: 'items per customer, 1 to 1000 (required)',
    out: 'the file to write (required)',
    format: 'csv or jsonl (default: jsonl when --out ends in .jsonl, else csv)',
  },
  help: 'Customers file: one external id per line (a header line is skipped). Ties: higher score, then lower item id.',
  async run(env) {
    const customersFile = str(env, 'customers');
    const all = env.values['all'] === true;
    if (!customersFile === !all) throw new UsageError('give exactly one of --customers FILE and --all');
    const out = str(env, 'out');
    if (!out) throw new UsageError('missing --out FILE');
    const top = int(env, 'top');
    if (top === undefined) throw new UsageError('missing --top N');
    const format = str(env, 'format');
    if (format !== undefined && format !== 'csv' && format !== 'jsonl') throw new UsageError(`--format must be csv or jsonl, got '${format}'`);
    const { table: t } = env.api();
    const r = await call(t, 'recommend', only({ customersFile, all, n: top, out, format: format as 'csv' | 'jsonl' | undefined }));
    if (env.json) env.io.out(JSON.stringify(r, null, 2));
    else {
      const u = r.unknownCustomers;
      env.io.out(
        `${r.file}: ${r.rows} rows for ${r.customers} customers (${r.format}) in ${formatNumber(r.elapsedMs / 1000)} s` +
          (u.distinct ? `\n${u.distinct} unknown customers skipped, e.g. ${u.examples.join(', ')}` : '') +
          `\nties: ${r.tieRule}; hybrid: ${r.weightsFrom}${r.notes.length ? `\n${r.notes.join('\n')}` : ''}`,
      );
    }
    return EXIT.ok;
  },
};

export const modelCommands: readonly CliCommand[] = [trainCommand, modelsCommand, evaluateCommand, similarCommand, proposeCommand, recommendCommand];
