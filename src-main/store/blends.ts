import type { ValidatedBlend } from '../core/eval/validated-blend.ts';
import type { Db } from './workspace.ts';

/** A stored validated blend (migration 005) with the models it was learned with. */
export interface StoredBlend {
  id: number;
  createdAt: number;
  fingerprint: string;
  modelIds: number[];
  blend: ValidatedBlend;
}

interface BlendRow {
  id: number;
  created_at: number;
  fingerprint: string;
  model_ids: string;
  spec: string;
}

/**
 * The validated blend of each training run. `save` runs inside the caller's transaction (training stores
 * its models and their blend together); the newest row is the current blend and one older row is kept.
 */
export class BlendRepo {
  readonly #insert;
  readonly #prune;
  readonly #latest;

  constructor(db: Db) {
    this.#insert = db.prepare(
      'INSERT INTO validated_blend (created_at, fingerprint, model_ids, spec) VALUES (@createdAt, @fingerprint, @modelIds, @spec)',
    );
    this.#prune = db.prepare('DELETE FROM validated_blend WHERE id NOT IN (SELECT id FROM validated_blend ORDER BY id DESC LIMIT 2)');
    this.#latest = db.prepare<[], BlendRow>('SELECT * FROM validated_blend ORDER BY id DESC LIMIT 1');
  }

  save(blend: ValidatedBlend, fingerprint: string, modelIds: readonly number[], createdAt = Date.now()): number {
    // NaN (no customer measured) is not JSON: it is stored as null and read back as NaN.
    const spec = JSON.stringify(blend, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v));
    const id = Number(this.#insert.run({ createdAt, fingerprint, modelIds: JSON.stringify(modelIds), spec }).lastInsertRowid);
    this.#prune.run();
    return id;
  }

  current(): StoredBlend | undefined {
    const r = this.#latest.get();
    if (!r) return undefined;
    const blend = JSON.parse(r.spec, (k, v: unknown) => (v === null && k === 'ndcg' ? Number.NaN : v)) as ValidatedBlend;
    return { id: r.id, createdAt: r.created_at, fingerprint: r.fingerprint, modelIds: JSON.parse(r.model_ids) as number[], blend };
  }
}
