import { z } from 'zod';
import { ReasonView } from './reason.ts';
import { AudienceSchema } from '../../core/editing/brief-schema.ts';
import { SPLIT_CHOICES } from '../../core/eval/split-choice.ts';
import { VALUE_TRANSFORMS } from '../../core/matrix/values.ts';
import { TUNE_BUDGET } from '../../core/models/tune-budget.ts';
import { method } from '../define.ts';
import { ModelOriginView } from './cluster.ts';
import { JobState } from './jobs.ts';

/**
 * Models: training (optionally tuned), the model list, offline evaluation, evaluation against a holdout
 * file, item neighbours and search, ad-hoc proposals and the per-customer top-N export. Items and customers
 * are named by their external ids. Metrics with no data (NaN in core) cross the boundary as null.
 */
const reading = z.number().nullable();
const ModelKindName = z.enum(['content', 'itemknn', 'ials', 'ease', 'popularity']);
/** How a signal's summed value enters item-kNN and EASE (core/matrix/values.ts). */
const ValueTransformName = z.enum(VALUE_TRANSFORMS);

/** How a training run is tuned (see `tune` below). */
const TuneRequest = z
  .object({
    k: z.number().int().min(1).default(10),
    sampleCustomers: z.number().int().min(1).optional(),
    seed: z.number().int().optional(),
    when: z.enum(['always', 'changed']).default('always'),
    budget: z.number().min(TUNE_BUDGET.min).max(TUNE_BUDGET.max).optional(),
  })
  .strict();

/**
 * The recency half-lives of item-kNN and EASE (core/matrix/values.ts "Recency"): days > 0, or null for off
 * (held off during tuning); left out, tuning searches them when the signals have times.
 */
const RecencyFields = {
  fitHalfLifeDays: z.number().positive().finite().nullable().optional(),
  profileHalfLifeDays: z.number().positive().finite().nullable().optional(),
};

export const TrainRequest = z
  .object({
    /** Which models (default all five). */
    models: z.array(ModelKindName).min(1).optional(),
    ials: z
      .object({
        factors: z.number().int().min(1).max(1024).optional(),
        iterations: z.number().int().min(1).optional(),
        regularization: z.number().min(0).optional(),
        alpha: z.number().min(0).optional(),
        scaling: z.enum(['linear', 'log']).optional(),
        seed: z.number().int().optional(),
      })
      .strict()
      .optional(),
    itemknn: z
      .object({
        k: z.number().int().min(1).optional(),
        shrink: z.number().min(0).optional(),
        values: ValueTransformName.optional(),
        normalize: z.enum(['none', 'sum']).optional(),
        ...RecencyFields,
      })
      .strict()
      .optional(),
    ease: z.object({ lambda: z.number().positive().optional(), values: ValueTransformName.optional(), ...RecencyFields }).strict().optional(),
    /** Recent popularity's fit half-life (null: all-time counts); tuning does not search it by default (grid.ts). */
    popularity: z.object({ fitHalfLifeDays: RecencyFields.fitHalfLifeDays }).strict().optional(),
    /** Content's profile half-life (null: off); left out, tuning searches it when the signals have times. */
    content: z.object({ profileHalfLifeDays: RecencyFields.profileHalfLifeDays }).strict().optional(),
    threads: z.number().int().min(1).max(8).optional(),
    /**
     * Tune each model's grid on a validation split first, then train the best settings on all signals. `when`:
     * 'always' tunes; 'changed' tunes only when the data changed since the last tuning, else trains that
     * tuning's settings again. `budget`: plain fits the search may spend (grid.ts TUNE_BUDGET, default 3).
     * Left out, training follows the product's default (services/tune/train-tuned.ts DEFAULT_TUNE: tune when the data changed), whoever
     * asks (the app's Train button, `shelfwright train`); `false` trains the defaults and the given values as
     * they are, with no search.
     */
    tune: z.union([z.literal(false), TuneRequest]).optional(),
  })
  .strict();

/** One row of an evaluation table (offline split or holdout file). */
export const MetricsRow = z.object({
  model: z.string(),
  k: z.number().int(),
  ndcg: reading,
  /** Recall@K with denominator min(K, |truth|) (Liang et al. 2018). */
  recall: reading,
  precision: reading,
  map: reading,
  hitRate: reading,
  coverage: reading,
  novelty: reading,
  customers: z.number().int(),
});

export const GridTrialView = z.object({
  params: z.record(z.string(), z.union([z.number(), z.string()])),
  ndcg: reading,
  recall: reading,
  elapsedMs: z.number(),
});

export const TuningView = z.object({
  k: z.number().int(),
  tunedAt: z.number(),
  split: z.object({ method: z.enum(['time', 'random']), train: z.number().int(), validation: z.number().int(), customers: z.number().int() }),
  /** 'hybrid' only on a content model tuned before the validated blend: the retired grid of the hybrid's content weight. */
  grid: z.object({
    model: z.string(),
    best: z.record(z.string(), z.union([z.number(), z.string()])),
    ndcg: reading,
    trials: z.array(GridTrialView),
    /** Grid parameters the user fixed with their own flags (absent for models tuned before they could). */
    fixed: z.record(z.string(), z.union([z.number(), z.string()])).optional(),
    /** False when every grid parameter was fixed, so nothing was searched. */
    searched: z.boolean().optional(),
    /** What the coordinate search covered (absent for grids tuned before it): axes, budget and spend in plain fits. */
    search: z
      .object({
        axes: z.record(z.string(), z.array(z.union([z.number(), z.string()]))),
        budgetPlainFits: z.number(),
        spentPlainFits: z.number(),
        stopped: z.enum(['converged', 'budget']),
      })
      .optional(),
  }),
  /** The data fingerprint the tuning saw (absent for tunings stored before it was kept). */
  fingerprint: z.string().optional(),
  /** Only on content models tuned before the validated blend (the retired content-weight search). */
  hybridContentWeight: z.number().optional(),
});

export const ModelInfo = z.object({
  id: z.number().int(),
  kind: z.string(),
  params: z.record(z.string(), z.unknown()),
  trainedAt: z.number(),
  trainMs: z.number(),
  iterations: z.number().int().nullable(),
  losses: z.array(z.number()),
  notes: z.array(z.string()),
  stale: z.boolean(),
  sizeBytes: z.number().int(),
  /** This model's row of the latest offline evaluation, if one ran after it was trained. */
  evaluation: MetricsRow.extend({ evaluatedAt: z.number() }).nullable(),
  tuning: TuningView.nullable(),
  /**
   * The tuner's notes about this model from the tuning its settings came from: why it was not tuned (EASE above
   * its item limit, with tuning null), what a rule decided or the search left out. Empty when none.
   */
  tuningNotes: z.array(z.string()),
  /** Where a model trained elsewhere came from (null: trained here). */
  origin: ModelOriginView.nullable(),
});

/** The validated blend stored with the models (issue 10 item 3): what the hybrid is, and the figures it was chosen by. */
export const HybridView = z.object({
  kind: z.enum(['single', 'blend']),
  /** The single model the hybrid is (kind single), else null. */
  model: z.string().nullable(),
  weights: z.record(z.string(), z.number()),
  normalisation: z.enum(['zscore', 'rank']),
  coldContent: z.boolean(),
  /** False when too few validation customers: the best single model, unvalidated. */
  validated: z.boolean(),
  /** The blend in a phrase ("0.6 itemknn + 0.4 ials (z-scores per customer)", "is ease"). */
  description: z.string(),
  /** Why, in words, with the validation figures. */
  reason: z.string(),
  validation: z.object({
    k: z.number().int(),
    customers: z.number().int(),
    ndcg: z.number().nullable(),
    singles: z.array(z.object({ model: z.string(), ndcg: z.number().nullable() })),
    bestSingle: z.string(),
    method: z.enum(['time', 'random']).nullable(),
  }),
  learnedAt: z.number(),
  /** The workspace changed since the blend was learned. */
  stale: z.boolean(),
});

export const OfflineEvaluation = z.object({
  k: z.number().int(),
  evaluatedAt: z.number(),
  /** The workspace changed, or the models were retrained, since this evaluation ran. */
  stale: z.boolean(),
  /** Why it is stale, in words (null when current). */
  staleReason: z.string().nullable(),
  /**
   * Which split measured the figures: by time (cuts in unix ms) or per customer at random (no cuts), and why in
   * words (null for an evaluation stored before the split could be chosen: those were all by time).
   */
  split: z.object({
    method: z.enum(['time', 'random']),
    why: z.string().nullable(),
    validationFrom: z.number().nullable(),
    testFrom: z.number().nullable(),
    train: z.number().int(),
    validation: z.number().int(),
    test: z.number().int(),
  }),
  /** The hybrid's weight of each model, chosen on the validation window. */
  weights: z.record(z.string(), z.number()),
  /** What the hybrid is and why, in words (null for an evaluation stored before blends were validated). */
  hybrid: z.string().nullable(),
  /** Best NDCG first: single models, the hybrid, popularity and random baselines. */
  rows: z.array(MetricsRow),
  notes: z.array(z.string()),
});

const Unknown = z.object({ distinct: z.number().int(), rows: z.number().int(), examples: z.array(z.string()) });

export const HoldoutResult = z.object({
  file: z.string(),
  k: z.number().int(),
  rows: z.number().int(),
  usableRows: z.number().int(),
  pairs: z.number().int(),
  customers: z.number().int(),
  unknownCustomers: Unknown,
  unknownItems: Unknown,
  alreadyInWorkspace: z.number().int(),
  duplicateRows: z.number().int(),
  customersWithoutNewItems: z.number().int(),
  coldCustomers: z.number().int(),
  /** Best NDCG first; `stale` is null for the hybrid and the random baseline. */
  models: z.array(MetricsRow.extend({ stale: z.boolean().nullable() })),
  weightsFrom: z.string(),
  mapping: z.record(z.string(), z.string()),
  notes: z.array(z.string()),
  /** Asked with `perCustomer`: the customers' ids and each model's NDCG@K per customer, in that order. */
  perCustomer: z.object({ customers: z.array(z.string()), ndcg: z.record(z.string(), z.array(z.number())) }).optional(),
});

const ItemRef = z.object({ item: z.string(), title: z.string(), category: z.string(), promoted: z.boolean() });

export const Neighbour = ItemRef.extend({
  /** The blend used for the order: brief-default weights of content and collaborative, renormalised. */
  score: z.number(),
  content: reading,
  collaborative: reading,
  /** Which similarity contributes more to the score. */
  mainReason: z.enum(['content', 'collaborative']),
  /** Fewer customers than the cold-start threshold: only content can vouch for it. */
  coldStart: z.boolean(),
});

const Evidence = z.object({ item: z.string(), title: z.string(), similarity: z.number() });

export const ProposedView = ItemRef.extend({
  /** Promoted items are labelled "Sponsored" in words wherever shown. */
  sponsored: z.boolean(),
  score: z.number(),
  percentile: z.number(),
  /** Place by score in the pool, 1 = best (ties share the best place): tells apart what "top 1%" cannot. */
  rank: z.number().int().min(1),
  /** The main reason, from the data (core/curation/reasons.ts); null when no part has evidence to show. */
  reason: ReasonView.nullable(),
  coldStart: z.boolean(),
  contributions: z.record(z.string(), z.number()),
  raw: z.record(z.string(), reading),
  evidence: z.object({ content: z.array(Evidence), collaborative: z.array(Evidence) }),
});

export const ProposeRequest = z
  .object({
    anchors: z.array(z.string().min(1)).default([]),
    categories: z.array(z.string()).default([]),
    excludeCategories: z.array(z.string()).default([]),
    tags: z.array(z.string()).default([]),
    suppliers: z.array(z.string()).default([]),
    minPrice: z.number().min(0).optional(),
    maxPrice: z.number().min(0).optional(),
    maxAgeDays: z.number().min(0).optional(),
    audience: AudienceSchema.optional(),
    weights: z.record(z.string(), z.number().min(0)).optional(),
    n: z.number().int().min(1).max(500).default(20),
    /** Edition date, YYYY-MM-DD or unix ms; default today. */
    date: z.union([z.string(), z.number()]).optional(),
  })
  .strict();

export const modelMethods = {
  'train.start': method({
    summary: 'Train the models (optionally tuning them first) as a job; poll job.status, stop with job.cancel.',
    request: TrainRequest,
    response: JobState,
  }),
  'models.list': method({
    summary: 'Each current model: kind, parameters, training time and losses, notes, stale flag, evaluation, tuning; and the hybrid (the validated blend).',
    request: z.object({}).strict(),
    response: z.object({ models: z.array(ModelInfo), hybrid: HybridView.nullable() }),
  }),
  'evaluate.start': method({
    summary: 'Evaluate every model and baseline on a held-out split as a job; the result is stored with the models.',
    request: z
      .object({
        k: z.number().int().min(1).max(200).default(10),
        sampleCustomers: z.number().int().min(1).optional(),
        /** 'auto': by time when the signals carry times, else per customer at random (said in `split.why`). */
        split: z.enum(SPLIT_CHOICES).default('auto'),
      })
      .strict(),
    response: JobState,
  }),
  'evaluate.latest': method({
    summary: 'The latest stored offline evaluation, kept (marked stale) after a retrain; null when none is stored.',
    request: z.object({}).strict(),
    response: z.object({ evaluation: OfflineEvaluation.nullable() }),
  }),
  'evaluate.holdout': method({
    summary: "Score every trained model against exactly the pairs of the user's holdout file.",
    request: z
      .object({
        source: z.union([z.object({ file: z.string().min(1) }).strict(), z.object({ fileName: z.string().min(1), content: z.string() }).strict()]),
        k: z.number().int().min(1).max(500).default(20),
        format: z.enum(['csv', 'json', 'jsonl']).optional(),
        delimiter: z.string().length(1).optional(),
        dateOrder: z.enum(['dmy', 'mdy']).optional(),
        mapping: z.record(z.string(), z.string()).optional(),
        /** Also answer each customer's NDCG@K per model (paired standard errors between models). */
        perCustomer: z.boolean().default(false),
      })
      .strict(),
    response: HoldoutResult,
  }),
  'item.similar': method({
    summary: 'The items most like one item, each with its content and collaborative similarity.',
    request: z.object({ item: z.string().min(1, 'name an item'), n: z.number().int().min(1).max(200).default(10) }).strict(),
    response: z.object({ item: ItemRef, neighbours: z.array(Neighbour), notes: z.array(z.string()) }),
  }),
  'item.search': method({
    summary: 'Items whose title or external id contains the query (for pickers).',
    request: z.object({ query: z.string(), limit: z.number().int().min(1).max(200).default(20) }).strict(),
    response: z.object({ items: z.array(ItemRef) }),
  }),
  propose: method({
    summary: 'A ranked, explained pool for an ad-hoc brief (anchors, filters, price band, age window).',
    request: ProposeRequest,
    response: z.object({
      items: z.array(ProposedView),
      poolSize: z.number().int(),
      excluded: z.record(z.string(), z.number().int()),
      weights: z.record(z.string(), z.number()),
      date: z.string(),
      scoreMs: z.number(),
      notes: z.array(z.string()),
    }),
  }),
  recommend: method({
    summary: "Write every listed customer's top-N (CSV or JSON Lines) with per-component contributions.",
    request: z
      .object({
        customers: z.array(z.string().min(1)).optional(),
        customersFile: z.string().min(1).optional(),
        all: z.boolean().default(false),
        n: z.number().int().min(1).max(1000).default(10),
        out: z.string().min(1, 'name the output file'),
        format: z.enum(['csv', 'jsonl']).optional(),
      })
      .strict(),
    response: z.object({
      file: z.string(),
      format: z.enum(['csv', 'jsonl']),
      customers: z.number().int(),
      rows: z.number().int(),
      unknownCustomers: Unknown,
      duplicateCustomers: z.number().int(),
      weightsFrom: z.string(),
      tieRule: z.string(),
      elapsedMs: z.number(),
      notes: z.array(z.string()),
    }),
  }),
};
