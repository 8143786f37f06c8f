import { InputError } from '../errors.ts';

/**
 * A compact binary container for models: an 8-byte magic tag, a format version, then named sections of
 * typed-array bytes. Each section is 4-byte aligned so it can be read back as a typed-array view without
 * copying element by element. Little-endian throughout (every platform we run on).
 *
 * Layout: magic[8] | u32 version | u32 sectionCount | per section: u32 type, u32 length (elements),
 * bytes (padded to 4).
 */
type Section = Int32Array | Float32Array | Float64Array;
const TYPE_CODE = { i32: 1, f32: 2, f64: 3 } as const;

export function packSections(magic: string, version: number, sections: Section[]): Uint8Array {
  if (magic.length !== 8) throw new RangeError('magic must be 8 ASCII characters');
  let size = 16;
  for (const s of sections) size += 8 + align4(s.byteLength) + (s instanceof Float64Array ? 4 : 0);
  const out = new Uint8Array(size);
  const view = new DataView(out.buffer);
  for (let k = 0; k < 8; k++) out[k] = magic.charCodeAt(k);
  view.setUint32(8, version, true);
  view.setUint32(12, sections.length, true);
  let off = 16;
  for (const s of sections) {
    const code = s instanceof Int32Array ? TYPE_CODE.i32 : s instanceof Float32Array ? TYPE_CODE.f32 : TYPE_CODE.f64;
    view.setUint32(off, code, true);
    view.setUint32(off + 4, s.length, true);
    off += 8;
    if (code === TYPE_CODE.f64 && off % 8 !== 0) off += 4; // Float64 views need 8-byte alignment
    out.set(new Uint8Array(s.buffer, s.byteOffset, s.byteLength), off);
    off += align4(s.byteLength);
  }
  return out.slice(0, off);
}

/** Reads what `packSections` wrote; throws InputError on a wrong tag, version or truncated bytes. */
export function unpackSections(bytes: Uint8Array, magic: string, version: number): Section[] {
  const fail = (why: string): never => {
    throw new InputError(`not a valid ${magic.trim()} model: ${why}`);
  };
  if (bytes.length < 16) fail('too short');
  for (let k = 0; k < 8; k++) if (bytes[k] !== magic.charCodeAt(k)) fail('wrong format tag');
  // Copy once into a fresh, aligned buffer: the input may be a view at any offset (e.g. a SQLite blob).
  const buf = new Uint8Array(bytes.length);
  buf.set(bytes);
  const view = new DataView(buf.buffer);
  const v = view.getUint32(8, true);
  if (v !== version) fail(`format version ${v}, expected ${version}`);
  const count = view.getUint32(12, true);
  const out: Section[] = [];
  let off = 16;
  for (let s = 0; s < count; s++) {
    if (off + 8 > buf.length) fail('truncated');
    const code = view.getUint32(off, true);
    const len = view.getUint32(off + 4, true);
    off += 8;
    if (code === TYPE_CODE.f64 && off % 8 !== 0) off += 4;
    const width = code === TYPE_CODE.f64 ? 8 : 4;
    if (code < 1 || code > 3) fail(`unknown section type ${code}`);
    if (off + len * width > buf.length) fail('truncated');
    out.push(
      code === TYPE_CODE.i32
        ? new Int32Array(buf.buffer, off, len)
        : code === TYPE_CODE.f32
          ? new Float32Array(buf.buffer, off, len)
          : new Float64Array(buf.buffer, off, len),
    );
    off += align4(len * width);
  }
  return out;
}

/** The version word of a container, to read older formats (0 when too short; SectionReader then refuses it). */
export function formatVersion(bytes: Uint8Array): number {
  return bytes.length < 12 ? 0 : new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(8, true);
}

/** Reads sections back in the order they were packed, checking each one's element type. */
export class SectionReader {
  #sections: Section[];
  #next = 0;
  readonly #magic: string;
  constructor(bytes: Uint8Array, magic: string, version: number) {
    this.#sections = unpackSections(bytes, magic, version);
    this.#magic = magic.trim();
  }
  i32(): Int32Array {
    return this.#take(Int32Array, 'Int32');
  }
  f32(): Float32Array {
    return this.#take(Float32Array, 'Float32');
  }
  f64(): Float64Array {
    return this.#take(Float64Array, 'Float64');
  }
  #take<T extends Section>(ctor: new (n: number) => T, name: string): T {
    const s = this.#sections[this.#next++];
    if (!(s instanceof ctor)) throw new InputError(`not a valid ${this.#magic} model: section ${this.#next} is not ${name}`);
    return s;
  }
}

function align4(n: number): number {
  return (n + 3) & ~3;
}
