
/**
 * One item picture made small, with sharp (libvips). Decoding and encoding run on libuv's thread pool
 * (sharp's own design), so the event loop stays free while an import makes hundreds of them.
 */

/** The settings below, as a number stored with each thumbnail: change any of them and raise it. */

/**
 * sharp (a native addon with libvips) loads on the first picture, not with the module: every command that
 * imports the ingest layer would otherwise pay for it at start-up (bench:cli).
 */
let sharpLoaded: Promise<typeof import('sharp')> | undefined;
const loadSharp = async () => (await (sharpLoaded ??= import('sharp'))).default;

export const THUMB_RECIPE = 1;
/** Thumbnails fit a 96 px square (twice the 48 px the page draws them at, for high-density screens). */
export const THUMB_SIDE = 96;
/** The most a stored thumbnail may take; migration 008 checks the same bound. */
export const MAX_THUMB_BYTES = 32 * 1024;
/** A picture file above this is refused with its row: a catalogue photo is far smaller. */
export const MAX_PICTURE_BYTES = 20 * 1024 * 1024;
/**
 * Decoding stops above this many pixels (sharp's `limitInputPixels`): a small file can claim a huge canvas
 * (a "decompression bomb") and take the machine's memory. 40 megapixels passes any camera photo.
 */
export const MAX_PICTURE_PIXELS = 40_000_000;
/**
 * Formats read. SVG is not: it is a document that can name other files and addresses, which the importer
 * must not follow; a shop exports photos as one of these.
 */
const READABLE = new Set(['jpeg', 'png', 'webp', 'gif', 'tiff', 'avif', 'heif']);
/** WebP qualities tried in turn until the thumbnail fits MAX_THUMB_BYTES. */
const QUALITIES = [80, 60, 40];

export interface ThumbImage {
  mime: 'image/webp';
  width: number;
  height: number;
  data: Buffer;
}
export type ThumbResult = { ok: true; thumb: ThumbImage } | { ok: false; reason: string };

/**
 * The thumbnail of one picture file's bytes: turned upright by its EXIF orientation, fitted inside
 * THUMB_SIDE² (never enlarged), WebP, with no metadata kept (sharp strips EXIF, XMP and ICC unless asked to keep them, so no
 * camera, place or owner travels with it). A file that is not a readable picture gives its reason, never a
 * throw: the importer shows a placeholder for it and warns.
 */
export async function makeThumbnail(bytes: Buffer): Promise<ThumbResult> {
  const sharp = await loadSharp();
  let format: string | undefined;
  try {
    format = (await sharp(bytes, { limitInputPixels: MAX_PICTURE_PIXELS }).metadata()).format;
  } catch (e) {
    return { ok: false, reason: `not a picture sharp can read (${firstLine(e)})` };
  }
  if (format === undefined || !READABLE.has(format)) {
    const what = format === 'svg' ? 'an SVG drawing (it may name other files, so it is not read)' : `a ${format ?? 'unknown'} file`;
    return { ok: false, reason: `${what}; use JPEG, PNG, WebP, GIF, TIFF or AVIF` };
  }
  for (const quality of QUALITIES) {
    try {
      // failOn 'error': a truncated or corrupt file is refused instead of drawn half grey.
      const { data, info } = await sharp(bytes, { failOn: 'error', limitInputPixels: MAX_PICTURE_PIXELS })
        .rotate()
        .resize(THUMB_SIDE, THUMB_SIDE, { fit: 'inside', withoutEnlargement: true })
        .webp({ quality })
        .toBuffer({ resolveWithObject: true });
      if (data.length <= MAX_THUMB_BYTES) return { ok: true, thumb: { mime: 'image/webp', width: info.width, height: info.height, data } };
    } catch (e) {
      return { ok: false, reason: `the ${format} file is damaged or too large to decode (${firstLine(e)})` };
    }
  }
  return { ok: false, reason: `its thumbnail stays above ${MAX_THUMB_BYTES / 1024} KB even at low quality` };
}

function firstLine(e: unknown): string {
  return (e instanceof Error ? e.message : String(e)).split('\n')[0]!.slice(0, 160);
}
