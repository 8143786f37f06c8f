import { DEFAULT_WEIGHTS, parseBrief } from '../../core/editing/brief-schema.ts';
import { describeBlend, type EvalResult } from '../../core/eval/index.ts';
import { BlendRepo } from '../../store/blends.ts';
import type { Db } from '../../store/workspace.ts';
import { InputError } from '../../core/errors.ts';
import type { AppContext } from '../../services/context.ts';
import { refuseImpossibleSplit } from '../../services/evaluate-split.ts';
import { evaluateHoldout } from '../../services/holdout/evaluate.ts';
import { evaluateJob, latestEvaluation, listModels, type ModelEvaluationRecord } from '../../services/models-status.ts';
import { propose } from '../../services/propose.ts';
import { readCustomerList, recommend } from '../../services/recommend.ts';
import { checkInputFile } from '../../services/user-file.ts';
import { searchItems, similarItems } from '../../services/recommend-items.ts';
import { trainJob } from '../../services/train/train-job.ts';
import { describeOrigin } from '../../services/cluster/origin-words.ts';
import type { TrainOptions } from '../../services/train/train-models.ts';
import { DEFAULT_TUNE, tunedTrainJob } from '../../services/tune/train-tuned.ts';
import { dataFingerprint } from '../../store/models.ts';
import { ItemRepo } from '../../store/items.ts';
import type { ResponseOf } from '../contract.ts';
import type { Handler } from '../handler-table.ts';
import { compact } from '../../core/util/compact.ts';

type Names =
  | 'train.start'
  | 'models.list'
  | 'evaluate.start'
  | 'evaluate.latest'
  | 'evaluate.holdout'
  | 'item.similar'
  | 'item.search'
  | 'propose'
  | 'recommend';

/** NaN and ±Infinity (a metric with no data) become null: JSON has no NaN, and the schemas say null. */
function finite<T>(v: T): T {
  if (typeof v === 'number') return (Number.isFinite(v) ? v : null) as T;
  if (Array.isArray(v)) return v.map(finite) as T;
  if (v !== null && typeof v === 'object' && !(v instanceof Uint8Array)) {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) out[k] = finite(x);
    return out as T;
  }
  return v;
}

/** An evaluation row for the table: Recall is Liang et al.'s (denominator min(K, |truth|)). */
function metricsRow(r: EvalResult) {
  return finite({
    model: r.model,
    k: r.k,
    ndcg: r.ndcg,
    recall: r.cappedRecall,
    precision: r.precision,
    map: r.map,
    hitRate: r.hitRate,
    coverage: r.coverage,
    novelty: r.novelty,
    customers: r.customers,
  });
}

/** The stored validated blend for `models.list` (null before the first training that learned one). */
function hybridView(db: Db): ResponseOf<'models.list'>['hybrid'] {
  const stored = new BlendRepo(db).current();
  if (!stored) return null;
  const b = stored.blend;
  return finite({
    kind: b.kind,
    model: b.model,
    weights: { ...b.weights } as Record<string, number>,
    normalisation: b.normalisation,
    coldContent: b.coldContent,
    validated: b.validated,
    description: describeBlend(b),
    reason: b.reason,
    validation: {
      k: b.validation.k,
      customers: b.validation.customers,
      ndcg: b.validation.ndcg,
      singles: b.validation.singles.map((x) => ({ model: x.model, ndcg: x.ndcg })),
      bestSingle: b.validation.bestSingle,
      method: b.validation.method ?? null,
    },
    learnedAt: stored.createdAt,
    stale: stored.fingerprint !== dataFingerprint(db),
  });
}

/** Drops keys whose value is undefined (zod's optional output meets exactOptionalPropertyTypes). */
/** YYYY-MM-DD (UTC midnight) or unix ms; default today at UTC midnight. */
export function parseDate(v: string | number | undefined, field = 'date'): number {
  if (v === undefined) return Math.floor(Date.now() / 86_400_000) * 86_400_000;
  if (typeof v === 'number') return v;
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(v.trim());
  const t = m ? Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) : Number.NaN;
  if (!m || Number.isNaN(t) || new Date(t).toISOString().slice(0, 10) !== v.trim()) {
    throw new InputError(`${field} must be a date YYYY-MM-DD, got '${v}'`, { column: field });
  }
  return t;
}

export function modelHandlers(ctx: AppContext): { [M in Names]: Handler<M> } {
  return {
    'train.start': (req) => {
      const options: TrainOptions = {
        ...(req.models && { models: req.models }),
        params: {
          ...(req.ials && { ials: compact(req.ials) }),
          ...(req.itemknn && { itemknn: compact(req.itemknn) }),
          ...(req.ease && { ease: compact(req.ease) }),
          ...(req.popularity && { popularity: compact(req.popularity) }),
          ...(req.content && { content: compact(req.content) }),
        },
        ...(req.threads !== undefined && { threads: req.threads }),
      };
      const db = ctx.db;
      // No word on tuning: the product's default (DEFAULT_TUNE); `false`: a plain training.
      const body = req.tune === false ? trainJob(db, ctx.file, options) : tunedTrainJob(db, ctx.file, options, req.tune ? compact(req.tune) : DEFAULT_TUNE);
      return ctx.jobs.start('train', body);
    },

    'models.list': () => ({
      models: listModels(ctx.db).map((m) => {
        const ev = (m.evaluation as ModelEvaluationRecord | null) ?? {};
        const row = ev.offline?.test.find((r) => r.model === m.kind);
        const tuning = ev.tuning as ResponseOf<'models.list'>['models'][number]['tuning'] | undefined;
        return {
          id: m.id,
          kind: m.kind,
          params: m.params,
          trainedAt: m.trainedAt,
          trainMs: m.trainMs,
          iterations: m.report.iterations ?? null,
          losses: m.report.losses ?? [],
          notes: m.report.notes,
          stale: m.stale,
          sizeBytes: m.sizeBytes,
          evaluation: row && ev.offline ? { ...metricsRow(row), evaluatedAt: ev.offline.evaluatedAt } : null,
          tuning: tuning ? finite(tuning) : null,
          tuningNotes: ev.tunerNotes ?? [],
          origin: m.report.origin ? { ...m.report.origin, description: describeOrigin(m.report.origin) } : null,
        };
      }),
      hybrid: hybridView(ctx.db),
    }),

    'evaluate.start': (req) => {
      refuseImpossibleSplit(ctx.db, req.split);
      return ctx.jobs.start('evaluate', evaluateJob(ctx.db, ctx.file, { k: req.k, split: req.split, ...(req.sampleCustomers !== undefined && { sampleCustomers: req.sampleCustomers }) }));
    },

    'evaluate.latest': () => {
      const off = latestEvaluation(ctx.db);
      if (!off) return { evaluation: null };
      return {
        evaluation: {
          k: off.k,
          evaluatedAt: off.evaluatedAt,
          stale: off.retrainedSince || off.fingerprint !== dataFingerprint(ctx.db),
          staleReason: off.retrainedSince
            ? 'the models were retrained since: these figures measure the models before; evaluate again'
            : off.fingerprint !== dataFingerprint(ctx.db)
              ? 'the workspace changed since this evaluation; evaluate again for current figures'
              : null,
          // Evaluations stored before the split could be chosen were all by time and carry no words for it.
          split: { ...off.split, method: off.split.method ?? 'time', why: off.split.why ?? null },
          weights: { ...off.weights },
          hybrid: off.hybrid ?? null,
          rows: off.test.map(metricsRow),
          notes: off.notes,
        },
      };
    },

    'evaluate.holdout': async (req) => {
      if ('file' in req.source) checkInputFile(req.source.file, 'holdout file'); // a folder, said plainly
      const r = await evaluateHoldout(ctx.db, req.source, {
        k: req.k,
        ...(req.format && { format: req.format }),
        ...(req.delimiter && { delimiter: req.delimiter }),
        ...(req.dateOrder && { dateOrder: req.dateOrder }),
        ...(req.mapping && { mapping: req.mapping }),
        perCustomer: req.perCustomer,
      });
      return finite(r);
    },

    'item.similar': (req) => finite(similarItems(ctx.db, req.item, req.n)),

    'item.search': (req) => ({ items: searchItems(ctx.db, req.query, req.limit) }),

    propose: (req) => {
      const db = ctx.db;
      const items = new ItemRepo(db);
      const anchors = req.anchors.map((ext) => {
        const it = items.byExternalId(ext);
        if (!it) throw new InputError(`anchor item '${ext}' is not in the catalogue`, { column: 'anchors' });
        return it.id;
      });
      const editionDate = parseDate(req.date);
      const brief = parseBrief({
        size: Math.min(req.n, 200),
        anchors,
        ...(req.audience && { audience: req.audience }),
        include: { categories: req.categories, tags: req.tags, suppliers: req.suppliers },
        exclude: { categories: req.excludeCategories, tags: [], suppliers: [] },
        priceBand: { ...(req.minPrice !== undefined && { min: req.minPrice }), ...(req.maxPrice !== undefined && { max: req.maxPrice }) },
        ...(req.maxAgeDays !== undefined && { maxAgeDays: req.maxAgeDays }),
        weights: { ...DEFAULT_WEIGHTS, ...req.weights },
      });
      const p = propose(db, brief, { editionDate, n: req.n });
      const ext = (id: number) => items.byId(id)?.externalId ?? String(id);
      const ev = (e: { itemId: number; title: string; similarity: number }) => ({ item: ext(e.itemId), title: e.title, similarity: e.similarity });
      return finite({
        items: p.items.map((x) => ({
          item: x.externalId,
          title: x.title,
          category: items.byId(x.itemId)?.category ?? '',
          promoted: x.promoted,
          sponsored: x.promoted,
          score: x.score,
          percentile: x.percentile,
          rank: x.rank,
          reason: x.reason,
          coldStart: x.coldStart,
          contributions: { ...x.contributions },
          raw: { ...x.raw },
          evidence: { content: x.evidence.content.map(ev), collaborative: x.evidence.collaborative.map(ev) },
        })),
        poolSize: p.poolSize,
        excluded: p.excluded,
        weights: { ...p.weights },
        date: new Date(editionDate).toISOString().slice(0, 10),
        scoreMs: p.scoreMs,
        notes: p.notes,
      });
    },

    recommend: (req) => {
      const customers = req.customersFile ? readCustomerList(req.customersFile) : req.customers;
      if (!req.all && !customers) throw new InputError('give customers (a list or a file) or all: true');
      if (req.all && customers) throw new InputError('give either a customer list or all: true, not both');
      return recommend(ctx.db, {
        ...(customers && { customers }),
        all: req.all,
        n: req.n,
        out: req.out,
        ...(req.format && { format: req.format }),
      });
    },
  };
}
