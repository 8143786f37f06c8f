/**
 * External id (a string) -> row id (a positive integer), for the importer's hot path: two lookups per
 * signal row. An open-addressing hash table over typed arrays (linear probing, load factor at most 1/2),
 * each slot holding the key's index and its full 32-bit hash, so a probe touches one small array and
 * compares strings only when the hashes agree.
 *
 * Why not a Map: while a large file streams through the parser the Map's entries and key strings fall out
 * of the CPU caches, and each lookup then costs several cache misses. On 1M signal rows with 50,000
 * customers and 20,000 items this table took 0.38 s of lookups against 0.65 s for Map (papaparse
 * streaming the bench/import.bench.ts file, median of 2, measured 2026-12-02).
 *
 * The hash is FNV-1a (Fowler, Noll & Vo) over UTF-16 code units, with a final xor-shift so the low bits
 * used for the slot depend on every character.
 */
export class StringIdTable {
  #keys: string[] = [];
  #ids: number[] = [];
  /** Per slot: index into #keys + 1 (0 = empty). */
  #slots: Int32Array;
  #hashes: Int32Array;
  #mask: number;

  constructor(capacity = 16) {
    let size = 16;
    while (size < capacity * 2) size *= 2;
    this.#slots = new Int32Array(size);
    this.#hashes = new Int32Array(size);
    this.#mask = size - 1;
  }

  static from(keys: readonly string[], ids: ArrayLike<number>): StringIdTable {
    const t = new StringIdTable(keys.length);
    for (let i = 0; i < keys.length; i++) t.set(keys[i]!, ids[i]!);
    return t;
  }

  get size(): number {
    return this.#keys.length;
  }

  /** The row id of `key`, or -1 when the key is not in the table. */
  get(key: string): number {
    const h = hash(key);
    const slots = this.#slots;
    const hashes = this.#hashes;
    for (let s = h & this.#mask; ; s = (s + 1) & this.#mask) {
      const k = slots[s]!;
      if (k === 0) return -1;
      if (hashes[s] === h && this.#keys[k - 1] === key) return this.#ids[k - 1]!;
    }
  }

  has(key: string): boolean {
    return this.get(key) !== -1;
  }

  /** Adds `key`, or gives it a new row id if present. Row ids must be >= 0. */
  set(key: string, id: number): void {
    if (!(id >= 0)) throw new RangeError(`row id must be a non-negative number, got ${id}`);
    const h = hash(key);
    for (let s = h & this.#mask; ; s = (s + 1) & this.#mask) {
      const k = this.#slots[s]!;
      if (k === 0) {
        this.#keys.push(key);
        this.#ids.push(id);
        this.#slots[s] = this.#keys.length;
        this.#hashes[s] = h;
        if (this.#keys.length * 2 > this.#slots.length) this.#grow();
        return;
      }
      if (this.#hashes[s] === h && this.#keys[k - 1] === key) {
        this.#ids[k - 1] = id;
        return;
      }
    }
  }

  /** Keys and row ids in insertion order (to send the table to another thread as plain arrays). */
  entries(): { keys: string[]; ids: number[] } {
    return { keys: this.#keys.slice(), ids: this.#ids.slice() };
  }

  #grow(): void {
    const size = this.#slots.length * 2;
    const slots = new Int32Array(size);
    const hashes = new Int32Array(size);
    const mask = size - 1;
    for (let s = 0; s < this.#slots.length; s++) {
      const k = this.#slots[s]!;
      if (k === 0) continue;
      const h = this.#hashes[s]!;
      let t = h & mask;
      while (slots[t] !== 0) t = (t + 1) & mask;
      slots[t] = k;
      hashes[t] = h;
    }
    this.#slots = slots;
    this.#hashes = hashes;
    this.#mask = mask;
  }
}

function hash(key: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < key.length; i++) h = Math.imul(h ^ key.charCodeAt(i), 0x01000193);
  return h ^ (h >>> 15);
}
