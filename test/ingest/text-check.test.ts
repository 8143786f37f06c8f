import { describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { TextCheck } from '../../src-main/ingest/text-check.ts';

/**
 * The UTF-8 guard decodes chunk by chunk, taking a fast byte-for-byte path for ASCII chunks. The reference is
 * Node's own whole-buffer decoding (Buffer.toString('utf8')), and for invalid input the WHATWG Encoding
 * Standard's fatal mode, which Node's TextDecoder implements.
 */
function decodeInChunks(bytes: Buffer, cuts: number[]): string {
  const check = new TextCheck('t.csv');
  let out = '';
  let from = 0;
  for (const to of [...cuts, bytes.length]) {
    out += check.chunk(bytes.subarray(from, to));
    from = to;
  }
  return out + check.end();
}

describe('TextCheck', () => {
  const text = 'id,title\nA1,Plain\nA2,Pot 12 cm – é ✓ 🌱\nA3,Plain again\n';
  const bytes = Buffer.from(text, 'utf8');

  it('gives the same text as decoding the whole file, wherever the chunks are cut', () => {
    for (let a = 1; a < bytes.length; a++) {
      for (const b of [a + 1, a + 2, a + 3, bytes.length - 1]) {
        if (b <= a || b >= bytes.length) continue;
        expect(decodeInChunks(bytes, [a, b]), `cut at ${a}, ${b}`).toBe(text);
      }
    }
  });

  it('keeps a character split before an ASCII chunk whole (the fast path waits for the decoder)', () => {
    const four = Buffer.from('🌱', 'utf8'); // 4 bytes
    const file = Buffer.concat([Buffer.from('a,b\n'), four.subarray(0, 2), four.subarray(2), Buffer.from('\nplain,ascii\n')]);
    expect(decodeInChunks(file, [6, 8])).toBe('a,b\n🌱\nplain,ascii\n');
  });

  it('refuses a file that ends inside a character, and a lone continuation byte, with the line', () => {
    const cut = Buffer.from('a\nb\n🌱', 'utf8').subarray(0, 6);
    expect(() => decodeInChunks(cut, [5])).toThrow(InputError);
    // A lead byte at the end of one chunk, then plain ASCII: invalid, even though the next chunk alone is ASCII.
    const broken = Buffer.concat([Buffer.from('a,b\n'), Buffer.from([0xc3]), Buffer.from('xyz\n')]);
    expect(() => decodeInChunks(broken, [5])).toThrow(/not valid UTF-8/);
    const lone = Buffer.concat([Buffer.from('ok\nok\n'), Buffer.from([0x80]), Buffer.from('\n')]);
    const e = (() => {
      try {
        decodeInChunks(lone, [3]);
      } catch (x) {
        return x as InputError;
      }
      return undefined;
    })();
    expect(e?.message).toMatch(/not valid UTF-8 text \(byte 0x80\)/);
    expect(e?.where.line).toBe(3);
  });
});
