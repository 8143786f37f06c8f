import { SIGNAL_KINDS } from '../core/types.ts';
import type { ModelKind } from '../core/models/scorer.ts';
import type { Db } from './workspace.ts';

/** What training produces for one model kind, ready to store. */
export interface ModelRecord {
  kind: ModelKind;
  params: Record<string, unknown>;
  /** `dataFingerprint` of the workspace state the model was trained on. */
  fingerprint: string;
  trainedAt: number;
  trainMs: number;
  /** The fit report: iterations, losses, notes; `origin` only on a model trained elsewhere and imported. */
  report: { iterations?: number; losses?: number[]; notes: string[]; origin?: ModelOrigin };
  bytes: Uint8Array;
}

/**
 * Where an imported model came from (services/cluster/import-model.ts): shown on the models screen and by
 * `shelfwright models` ("trained on a cluster, imported 2026-12-04, rank 128"). Models trained here have none.
 */
export interface ModelOrigin {
  source: 'cluster';
  engine: 'Spark ALS';
  importedAt: number;
  /** When Spark saved the model (its metadata's timestamp), if recorded. */
  savedAt: number | null;
  sparkVersion: string;
  uid: string;
  rank: number;
  /** Spark's own parameters, as its metadata records them (null: not recorded, Spark's default applied). */
  regParam: number | null;
  alpha: number | null;
  maxIter: number | null;
  /** When the signals it was fitted on were exported from this workspace. */
  exportedAt: number;
  /** Customers of the workspace without a row in the model, folded in at import from their history. */
  customersFoldedIn: number;
  /** Items of the workspace without a row in the model but with signals, folded in at import (absent on older records). */
  itemsFoldedIn?: number;
  /** Items with neither a row in the model nor a signal: they score 0 until the next fit. */
  itemsWithoutFactors: number;
}

/** A stored model without its bytes (listings). */
export interface ModelSummary extends Omit<ModelRecord, 'bytes'> {
  id: number;
  current: boolean;
  evaluation: unknown;
  sizeBytes: number;
}

export interface StoredModel extends ModelSummary {
  bytes: Uint8Array;
}

export interface ModelStatus extends ModelSummary {
  /** The workspace's signals or catalogue changed since this model was trained. */
  stale: boolean;
}

interface ModelRow {
  id: number;
  kind: ModelKind;
  params: string;
  fingerprint: string;
  trained_at: number;
  train_ms: number;
  report: string;
  evaluation: string | null;
  current: number;
  size: number;
  bytes?: Buffer;
}

function rowToSummary(r: ModelRow): ModelSummary {
  return {
    id: r.id,
    kind: r.kind,
    params: JSON.parse(r.params) as Record<string, unknown>,
    fingerprint: r.fingerprint,
    trainedAt: r.trained_at,
    trainMs: r.train_ms,
    report: JSON.parse(r.report) as ModelRecord['report'],
    evaluation: r.evaluation === null ? null : (JSON.parse(r.evaluation) as unknown),
    current: r.current === 1,
    sizeBytes: r.size,
  };
}

const COLUMNS = 'id, kind, params, fingerprint, trained_at, train_ms, report, evaluation, current, length(bytes) AS size';

/**
 * Trained models. Saving makes the new model of each kind current and keeps at most `keepHistory`
 * older ones per kind (factor blobs run to tens of megabytes on large catalogues).
 */
export class ModelRepo {
  readonly #demote;
  readonly #insert;
  readonly #prune;
  readonly #current;
  readonly #list;
  readonly #evaluate;
  readonly #db: Db;

  constructor(db: Db, readonly keepHistory = 1) {
    this.#db = db;
    this.#demote = db.prepare<[string]>('UPDATE model SET current = 0 WHERE kind = ? AND current = 1');
    this.#insert = db.prepare(
      `INSERT INTO model (kind, params, fingerprint, trained_at, train_ms, report, bytes, current)
       VALUES (@kind, @params, @fingerprint, @trainedAt, @trainMs, @report, @bytes, 1)`,
    );
    this.#prune = db.prepare<[{ kind: string; keep: number }]>(
      `DELETE FROM model WHERE kind = @kind AND current = 0 AND id NOT IN
         (SELECT id FROM model WHERE kind = @kind AND current = 0 ORDER BY trained_at DESC, id DESC LIMIT @keep)`,
    );
    this.#current = db.prepare<[string], ModelRow>(`SELECT ${COLUMNS}, bytes FROM model WHERE kind = ? AND current = 1`);
    this.#list = db.prepare<[], ModelRow>(`SELECT ${COLUMNS} FROM model ORDER BY kind, current DESC, trained_at DESC, id DESC`);
    this.#evaluate = db.prepare<[string, number]>('UPDATE model SET evaluation = ? WHERE id = ?');
  }

  /** Stores the models of one training run in one transaction: all become current, or nothing changes. */
  saveAll(records: readonly ModelRecord[]): number[] {
    return this.#db.transaction(() =>
      records.map((r) => {
        this.#demote.run(r.kind);
        const id = Number(
          this.#insert.run({
            kind: r.kind,
            params: JSON.stringify(r.params),
            fingerprint: r.fingerprint,
            trainedAt: r.trainedAt,
            trainMs: r.trainMs,
            report: JSON.stringify(r.report),
            bytes: Buffer.from(r.bytes.buffer, r.bytes.byteOffset, r.bytes.byteLength),
          }).lastInsertRowid,
        );
        this.#prune.run({ kind: r.kind, keep: this.keepHistory });
        return id;
      }),
    )();
  }

  /** The model the scorer should use for `kind`, with its bytes. */
  loadCurrent(kind: ModelKind): StoredModel | undefined {
    const r = this.#current.get(kind);
    if (!r) return undefined;
    const b = r.bytes!;
    return { ...rowToSummary(r), bytes: new Uint8Array(b.buffer, b.byteOffset, b.byteLength) };
  }

  /** Every stored model, current first within each kind, newest first. */
  list(): ModelSummary[] {
    return this.#list.all().map(rowToSummary);
  }

  setEvaluation(id: number, evaluation: unknown): void {
    this.#evaluate.run(JSON.stringify(evaluation), id);
  }
}

/**
 * A cheap fingerprint of what the models train on, to tell when a model is stale. Not a cryptographic
 * hash: it is built from
 * - items: count, largest id, and an FNV-1a hash (Fowler, Noll & Vo; 32-bit) over every column of every
 *   row in id order, so any catalogue edit (title, tags, availability, ...) changes it;
 * - customers: count and largest id;
 * - signals: count, largest id, and the sums of `at`, `value`, a mix of (customer, item) and a code of
 *   `kind`, folded into the same hash. An added, removed or re-valued signal changes it; a change that
 *   leaves every sum equal (two signals swapping times) would not, which we accept for a one-scan check.
 * Cost: one scan of the item table and one aggregate over the signal table (tens of ms on the demo shop).
 */
/**
 * The kind term of the fingerprint: length(name) * 128 + unicode(name) of the kind's name, as computed
 * when kinds were stored as text (before migration 004), so models trained before that step stay current.
 */
export const FINGERPRINT_KIND_TERM = `CASE kind ${SIGNAL_KINDS.map((k, code) => `WHEN ${code} THEN ${k.length * 128 + k.codePointAt(0)!}`).join(' ')} END`;

export function dataFingerprint(db: Db): string {
  let h = FNV_OFFSET;
  const items = db.prepare('SELECT * FROM item ORDER BY id').raw();
  let itemCount = 0;
  for (const row of items.iterate() as IterableIterator<unknown[]>) {
    itemCount++;
    for (const v of row) h = fnv1a(h, v === null ? '\u0000' : String(v)) ^ 0x1f;
  }
  const c = db.prepare('SELECT count(*) AS n, ifnull(max(id), 0) AS maxId FROM customer').get() as { n: number; maxId: number };
  const s = db
    .prepare(
      `SELECT count(*) AS n, ifnull(max(id), 0) AS maxId, total(at) AS at, total(value) AS value,
              total((customer_id * 1000003 + item_id) % 2147483647) AS pairs,
              total(${FINGERPRINT_KIND_TERM}) AS kinds
       FROM signal`,
    )
    .get() as { n: number; maxId: number; at: number; value: number; pairs: number; kinds: number };
  const maxItem = (db.prepare('SELECT ifnull(max(id), 0) FROM item').pluck().get() as number) ?? 0;
  h = fnv1a(h, [itemCount, maxItem, c.n, c.maxId, s.n, s.maxId, s.at, s.value, s.pairs, s.kinds].join('|'));
  return `v1-i${itemCount}-c${c.n}-s${s.n}-${(h >>> 0).toString(16).padStart(8, '0')}`;
}

const FNV_OFFSET = 0x811c9dc5;

/** FNV-1a, 32-bit, over the UTF-16 code units of `text`. */
function fnv1a(h: number, text: string): number {
  for (let q = 0; q < text.length; q++) {
    h ^= text.charCodeAt(q);
    h = Math.imul(h, 0x01000193);
  }
  return h;
}

/** The current model of each kind, marked stale when the workspace changed since it was trained. */
export function modelStatus(db: Db, repo = new ModelRepo(db)): ModelStatus[] {
  const now = dataFingerprint(db);
  return repo
    .list()
    .filter((m) => m.current)
    .map((m) => ({ ...m, stale: m.fingerprint !== now }));
}
