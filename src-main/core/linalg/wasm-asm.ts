/**
 * A minimal WebAssembly binary writer: just what the dense kernels (dots-kernel.ts) need. The module is
 * built as bytes at run time and compiled with `new WebAssembly.Module(bytes)`, so core needs no build step,
 * no binary file and no Node API. Encodings follow the WebAssembly core specification 2.0, §5 (binary
 * format) and the fixed-width SIMD proposal's opcode table (0xFD prefix, LEB128 sub-opcodes).
 */

/** Unsigned LEB128 (spec §5.2.2). */
export function uleb(n: number): number[] {
  const out: number[] = [];
  do {
    let byte = n & 0x7f;
    n >>>= 7;
    if (n !== 0) byte |= 0x80;
    out.push(byte);
  } while (n !== 0);
  return out;
}

/** Signed LEB128 for i32 constants (spec §5.2.2). */
export function sleb(n: number): number[] {
  const out: number[] = [];
  for (;;) {
    const byte = n & 0x7f;
    n >>= 7;
    if ((n === 0 && (byte & 0x40) === 0) || (n === -1 && (byte & 0x40) !== 0)) {
      out.push(byte);
      return out;
    }
    out.push(byte | 0x80);
  }
}

const utf8 = (s: string): number[] => Array.from(new TextEncoder().encode(s));
const vec = (items: number[][]): number[] => [...uleb(items.length), ...items.flat()];
const name = (s: string): number[] => [...uleb(utf8(s).length), ...utf8(s)];
const section = (id: number, body: number[]): number[] => [id, ...uleb(body.length), ...body];

export const T = { i32: 0x7f, f32: 0x7d, f64: 0x7c, v128: 0x7b } as const;

/** Instruction encodings used by the kernels (spec §5.4; SIMD opcodes after the 0xFD prefix). */
const simd = (op: number): number[] => [0xfd, ...uleb(op)];
export const op = {
  block: [0x02, 0x40],
  loop: [0x03, 0x40],
  end: [0x0b],
  br: (d: number) => [0x0c, ...uleb(d)],
  brIf: (d: number) => [0x0d, ...uleb(d)],
  get: (i: number) => [0x20, ...uleb(i)],
  set: (i: number) => [0x21, ...uleb(i)],
  tee: (i: number) => [0x22, ...uleb(i)],
  i32: (v: number) => [0x41, ...sleb(v)],
  i32Add: [0x6a],
  i32Mul: [0x6c],
  i32GeU: [0x4f],
  f64Load: (offset = 0) => [0x2b, 3, ...uleb(offset)],
  f64Store: (offset = 0) => [0x39, 3, ...uleb(offset)],
  f64Add: [0xa0],
  f64Zero: [0x44, 0, 0, 0, 0, 0, 0, 0, 0],
  select: [0x1b],
  v128Load: (offset = 0) => [...simd(0x00), 0, ...uleb(offset)],
  v128Zero: [...simd(0x0c), ...new Array<number>(16).fill(0)],
  shuffleHigh: [...simd(0x0d), 8, 9, 10, 11, 12, 13, 14, 15, 0, 1, 2, 3, 4, 5, 6, 7],
  f32x4Add: simd(0xe4),
  f32x4Mul: simd(0xe6),
  f64x2Add: simd(0xf0),
  f64x2PromoteLow: simd(0x5f),
  f64x2Lane: (l: number) => [...simd(0x21), l],
} as const;

export interface WasmFunction {
  name: string;
  params: number[];
  locals: number[];
  body: number[];
}

/**
 * A module importing one memory as env.memory (shared when `shared`, as threads need; spec §5.5.5 limits
 * flags 0x01 / 0x03) and exporting the given functions, none returning a value.
 */
export function assemble(fns: WasmFunction[], memory: { minPages: number; maxPages: number; shared: boolean }): Uint8Array<ArrayBuffer> {
  const types = section(1, vec(fns.map((f) => [0x60, ...vec(f.params.map((p) => [p])), 0])));
  const limits = [memory.shared ? 0x03 : 0x01, ...uleb(memory.minPages), ...uleb(memory.maxPages)];
  const imports = section(2, vec([[...name('env'), ...name('memory'), 0x02, ...limits]]));
  const funcs = section(3, vec(fns.map((_, i) => uleb(i))));
  const exports = section(7, vec(fns.map((f, i) => [...name(f.name), 0x00, ...uleb(i)])));
  const code = section(
    10,
    vec(
      fns.map((f) => {
        const body = [...vec(f.locals.map((t) => [1, t])), ...f.body, ...op.end];
        return [...uleb(body.length), ...body];
      }),
    ),
  );
  return Uint8Array.from([0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00, ...types, ...imports, ...funcs, ...exports, ...code]);
}
