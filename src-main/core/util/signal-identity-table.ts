/**
 * Signal identity (item, customer, kind, time) -> the row holding it: its row id and its current value.
 * The appending importer (store/catalogue-writes.ts) resolves repeats with it while the identity index is
 * dropped, exactly as the index's upsert would: a repeat never becomes a second row, its value replaces
 * the stored one. Open addressing with linear probing over typed arrays (load factor at most 1/2), as
 * StringIdTable: a Map keyed by a composite string would allocate one string per signal row.
 *
 * A missing time is keyed as -1, as the index keys it (`ifnull(at, -1)`, migration 004).
 */
export class SignalIdentityTable {
  #item: Int32Array;
  #customer: Int32Array;
  #kind: Uint8Array;
  #at: Float64Array;
  /** Per entry: the row id, and the value the row has after the rows seen so far. */
  #rowId: Float64Array;
  #value: Float64Array;
  /** Per entry: 1 when `value` was changed since `add` (the stored row needs an UPDATE). */
  #changed: Uint8Array;
  /** Per slot: entry index + 1 (0 = empty). */
  #slots: Int32Array;
  #mask: number;
  #size = 0;
  /** The slot where the last missed `find` stopped: `add` right after it fills that slot. */
  #missSlot = -1;

  constructor(expected = 16) {
    const n = Math.max(16, expected);
    this.#item = new Int32Array(n);
    this.#customer = new Int32Array(n);
    this.#kind = new Uint8Array(n);
    this.#at = new Float64Array(n);
    this.#rowId = new Float64Array(n);
    this.#value = new Float64Array(n);
    this.#changed = new Uint8Array(n);
    let slots = 16;
    while (slots < n * 2) slots *= 2;
    this.#slots = new Int32Array(slots);
    this.#mask = slots - 1;
  }

  get size(): number {
    return this.#size;
  }

  /** The entry of this identity, or -1. `at` NaN (no time) is keyed as -1. Row ids and times are integers. */
  find(item: number, customer: number, kind: number, at: number): number {
    const t = at === at ? at : -1;
    const slots = this.#slots;
    const mask = this.#mask;
    for (let s = hash(item, customer, kind, t) & mask; ; s = (s + 1) & mask) {
      const e = slots[s]! - 1;
      if (e < 0) {
        this.#missSlot = s;
        return -1;
      }
      if (this.#item[e] === item && this.#customer[e] === customer && this.#kind[e] === kind && this.#at[e] === t) return e;
    }
  }

  /** Adds an identity that `find` just missed (the call right before this one, with the same key). */
  add(item: number, customer: number, kind: number, at: number, rowId: number, value: number): number {
    if (this.#missSlot < 0) throw new RangeError('add() must follow a find() that missed');
    const e = this.#size++;
    if (e === this.#item.length) this.#growEntries();
    this.#item[e] = item;
    this.#customer[e] = customer;
    this.#kind[e] = kind;
    this.#at[e] = at === at ? at : -1;
    this.#rowId[e] = rowId;
    this.#value[e] = value;
    this.#slots[this.#missSlot] = e + 1;
    this.#missSlot = -1;
    if (this.#size * 2 > this.#slots.length) this.#rehash();
    return e;
  }

  value(e: number): number {
    return this.#value[e]!;
  }

  rowId(e: number): number {
    return this.#rowId[e]!;
  }

  /** Gives entry `e` a new value (a repeat whose value differs), to be written back by `eachChanged`. */
  setValue(e: number, value: number): void {
    this.#value[e] = value;
    this.#changed[e] = 1;
  }

  /** Calls `f(rowId, value)` for every entry whose value was changed by `setValue`. */
  eachChanged(f: (rowId: number, value: number) => void): void {
    for (let e = 0; e < this.#size; e++) if (this.#changed[e] === 1) f(this.#rowId[e]!, this.#value[e]!);
  }

  #growEntries(): void {
    const n = this.#item.length * 2;
    const grow = <T extends Int32Array | Uint8Array | Float64Array>(a: T, make: (n: number) => T): T => {
      const b = make(n);
      b.set(a);
      return b;
    };
    this.#item = grow(this.#item, (k) => new Int32Array(k));
    this.#customer = grow(this.#customer, (k) => new Int32Array(k));
    this.#kind = grow(this.#kind, (k) => new Uint8Array(k));
    this.#at = grow(this.#at, (k) => new Float64Array(k));
    this.#rowId = grow(this.#rowId, (k) => new Float64Array(k));
    this.#value = grow(this.#value, (k) => new Float64Array(k));
    this.#changed = grow(this.#changed, (k) => new Uint8Array(k));
  }

  #rehash(): void {
    const slots = new Int32Array(this.#slots.length * 2);
    const mask = slots.length - 1;
    for (let e = 0; e < this.#size; e++) {
      let s = hash(this.#item[e]!, this.#customer[e]!, this.#kind[e]!, this.#at[e]!) & mask;
      while (slots[s] !== 0) s = (s + 1) & mask;
      slots[s] = e + 1;
    }
    this.#slots = slots;
    this.#mask = mask;
  }
}

/**
 * Mixes the four key parts into 32 bits: multiply-xorshift rounds with the constants of MurmurHash3's
 * finaliser (Appleby), the time split into its low and high 32 bits (times are integers below 2^53).
 */
function hash(item: number, customer: number, kind: number, at: number): number {
  let h = Math.imul(item ^ 0x9e3779b9, 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13) ^ customer, 0xc2b2ae35);
  h = Math.imul(h ^ (h >>> 16) ^ (at >>> 0), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13) ^ Math.floor(at / 4294967296) ^ (kind << 24), 0xc2b2ae35);
  return h ^ (h >>> 16);
}
