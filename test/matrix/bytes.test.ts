import { describe, expect, it } from 'vitest';
import { SectionReader, packSections } from '../../src-main/core/matrix/bytes.ts';

describe('packSections / SectionReader', () => {
  it('round-trips typed arrays of every kind, also from an unaligned copy of the bytes', () => {
    const a = Int32Array.of(1, -2, 3);
    const b = Float32Array.of(0.5, Number.NaN);
    const c = Float64Array.of(Math.PI, -0);
    const bytes = packSections('SWTEST  ', 3, [a, b, c, new Int32Array(0)]);
    const shifted = new Uint8Array(bytes.length + 1).subarray(1);
    shifted.set(bytes);
    for (const input of [bytes, shifted]) {
      const r = new SectionReader(input, 'SWTEST  ', 3);
      expect(r.i32()).toEqual(a);
      expect(r.f32()).toEqual(b);
      expect(r.f64()).toEqual(c);
      expect(r.i32().length).toBe(0);
    }
  });

  it('names a wrong tag, version, section type and truncation', () => {
    const bytes = packSections('SWTEST  ', 1, [Int32Array.of(1, 2)]);
    expect(() => new SectionReader(bytes, 'SWOTHER ', 1)).toThrow(/wrong format tag/);
    expect(() => new SectionReader(bytes, 'SWTEST  ', 2)).toThrow(/format version 1, expected 2/);
    expect(() => new SectionReader(bytes, 'SWTEST  ', 1).f32()).toThrow(/section 1 is not Float32/);
    expect(() => new SectionReader(bytes.subarray(0, bytes.length - 1), 'SWTEST  ', 1)).toThrow(/truncated/);
  });
});
