/**
 * The demo shop's pictures: for each category a few colourings of its drawing (drawings.ts), rasterised to
 * 96 × 96 PNG by sharp, and a picture (or, for a few items, none) for each item. Everything follows from the
 * seed: the same seed gives byte-identical files (PNG encoding and librsvg's rendering are deterministic for
 * one installed sharp; no text, so no font is involved).
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { basename, join } from 'node:path';
import type { Rng } from '../../src-main/core/rng.ts';
import { drawing, type Palette } from './drawings.ts';
import { CATEGORIES } from './scenario.ts';

/** Colourings per category: enough for a shelf to look varied, few enough to draw in well under a second. */
export const PICTURE_VARIANTS = 6;
/** Items left without a picture, so the demo shows the placeholder too. */
export const NO_PICTURE_SHARE = 0.03;
/** The folder beside items.csv; the image column names files relative to items.csv, as the importer reads them. */
export const PICTURE_DIR = 'pictures';

/** A category's file name part: 'outdoor plants' -> 'outdoor-plants'. */
const slug = (category: string) => category.replace(/\s+/g, '-');

export function pictureFile(category: number, variant: number): string {
  return `${PICTURE_DIR}/${slug(CATEGORIES[category]!)}-${variant + 1}.png`;
}

/** Each item's picture path (relative to items.csv), or '' for none; drawn from its own random stream. */
export function assignPictures(rng: Rng, categories: readonly number[]): string[] {
  return categories.map((c) => {
    const none = rng.next() < NO_PICTURE_SHARE;
    const variant = rng.int(PICTURE_VARIANTS);
    return none ? '' : pictureFile(c, variant);
  });
}

/** Writes every category's colourings into `dir` (the pictures folder, or its temporary stand-in); returns the paths written. */
export async function writePictures(rng: Rng, dir: string): Promise<string[]> {
  await mkdir(dir, { recursive: true });
  // Loaded here, not with the module: the command line imports the generator, and only `demo` draws.
  const sharp = (await import('sharp')).default;
  const jobs: { file: string; svg: string }[] = [];
  CATEGORIES.forEach((category, c) => {
    for (let v = 0; v < PICTURE_VARIANTS; v++) jobs.push({ file: join(dir, basename(pictureFile(c, v))), svg: drawing(category, palette(rng)) });
  });
  // Palettes are drawn in a fixed order above; rendering may then run in parallel without changing a byte.
  await Promise.all(
    jobs.map(async (j) => writeFile(j.file, await sharp(Buffer.from(j.svg)).png({ compressionLevel: 9, adaptiveFiltering: false }).toBuffer())),
  );
  return jobs.map((j) => j.file);
}

/** A soft background and an object in a hue of its own, with the foliage kept green-ish. */
function palette(rng: Rng): Palette {
  const hue = rng.int(360);
  const bgHue = (hue + 150 + rng.int(60)) % 360;
  return {
    bg: hex(bgHue, 45, 90),
    main: hex(hue, 55 + rng.int(20), 55 + rng.int(10)),
    accent: hex((hue + 30 + rng.int(40)) % 360, 70, 62),
    dark: hex(hue, 30, 24),
    leaf: hex(95 + rng.int(50), 45 + rng.int(20), 38 + rng.int(10)),
    earth: hex(20 + rng.int(15), 40, 30 + rng.int(10)),
  };
}

/** HSL (degrees, percent, percent) as #rrggbb, by the CSS Color 4 conversion ("HSL to RGB"). */
export function hex(h: number, s: number, l: number): string {
  const sat = s / 100;
  const light = l / 100;
  const f = (n: number) => {
    const k = (n + h / 30) % 12;
    const a = sat * Math.min(light, 1 - light);
    const v = light - a * Math.max(-1, Math.min(k - 3, 9 - k, 1));
    return Math.round(v * 255).toString(16).padStart(2, '0');
  };
  return `#${f(0)}${f(8)}${f(4)}`;
}
