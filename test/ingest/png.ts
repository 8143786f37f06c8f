import zlib from 'node:zlib';

/**
 * A PNG written by hand from the PNG specification (W3C / ISO/IEC 15948, 3rd ed.): signature, IHDR, one IDAT
 * of zlib-compressed scanlines each led by filter type 0, IEND; each chunk's CRC-32 over type and data. Used
 * as test input made without the image library under test. Colour type 2 (RGB), bit depth 8.
 */
export function handPng(width: number, height: number, pixel: (x: number, y: number) => [number, number, number]): Buffer {
  const raw = Buffer.alloc(height * (1 + width * 3));
  for (let y = 0; y < height; y++) {
    const row = y * (1 + width * 3);
    raw[row] = 0; // filter: None
    for (let x = 0; x < width; x++) {
      const [r, g, b] = pixel(x, y);
      raw.set([r, g, b], row + 1 + x * 3);
    }
  }
  return pngOf(width, height, zlib.deflateSync(raw));
}

/** A PNG whose header claims `width` × `height` over rows of zeros (compresses to little: a decompression bomb). */
export function zeroPng(width: number, height: number): Buffer {
  return pngOf(width, height, zlib.deflateSync(Buffer.alloc(height * (1 + width * 3)), { level: 9 }));
}

function pngOf(width: number, height: number, idat: Buffer): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([8, 2, 0, 0, 0], 8); // bit depth 8, colour type 2 (truecolour), deflate, adaptive filtering, no interlace
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', idat), chunk('IEND', Buffer.alloc(0))]);
}

function chunk(type: string, data: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(data.length, 0);
  head.write(type, 4, 'latin1');
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(zlib.crc32(Buffer.concat([head.subarray(4), data])), 0);
  return Buffer.concat([head, data, crc]);
}

/**
 * Width and height of a WebP file, read from its container as RFC 9649 (WebP Image Format, 2024) lays it
 * out: 'RIFF' size 'WEBP', then a VP8X chunk (canvas width-1 and height-1, 24 bits each, at bytes 24 and 27),
 * a lossless 'VP8L' chunk (signature 0x2f, then 14-bit width-1 and height-1) or a lossy 'VP8 ' chunk (frame
 * tag, start code 9d 01 2a, then 14-bit width and height).
 */
export function webpSize(b: Buffer): { width: number; height: number; chunks: string[] } {
  if (b.toString('latin1', 0, 4) !== 'RIFF' || b.toString('latin1', 8, 12) !== 'WEBP') throw new Error('not a RIFF WEBP file');
  const chunks: string[] = [];
  for (let at = 12; at + 8 <= b.length; at += 8 + b.readUInt32LE(at + 4) + (b.readUInt32LE(at + 4) % 2)) chunks.push(b.toString('latin1', at, at + 4));
  const first = b.toString('latin1', 12, 16);
  if (first === 'VP8X') return { width: 1 + b.readUIntLE(24, 3), height: 1 + b.readUIntLE(27, 3), chunks };
  if (first === 'VP8L') {
    const bits = b.readUInt32LE(21);
    return { width: 1 + (bits & 0x3fff), height: 1 + ((bits >> 14) & 0x3fff), chunks };
  }
  if (first === 'VP8 ') {
    if (b[23] !== 0x9d || b[24] !== 0x01 || b[25] !== 0x2a) throw new Error('VP8 start code missing');
    return { width: b.readUInt16LE(26) & 0x3fff, height: b.readUInt16LE(28) & 0x3fff, chunks };
  }
  throw new Error(`unknown first chunk ${first}`);
}
