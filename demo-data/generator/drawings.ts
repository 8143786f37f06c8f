/**
 * Simple original illustrations, one motif per demo category, drawn as SVG on a 96 × 96 canvas. A palette
 * varies each drawing; shapes are plain rectangles, ellipses and paths, no text (so no font can change a
 * pixel). Drawn for this project; they imitate no product's artwork.
 */
import type { Category } from './scenario.ts';

export interface Palette {
  /** Background wash. */
  bg: string;
  /** The object's main colour. */
  main: string;
  /** A second colour on the object. */
  accent: string;
  /** Outlines and shadows. */
  dark: string;
  /** Foliage. */
  leaf: string;
  /** Soil and wood. */
  earth: string;
}

type Motif = (p: Palette) => string;

const leafPair = (x: number, y: number, p: Palette) =>
  `<path d="M${x} ${y} C${x - 14} ${y - 4} ${x - 16} ${y - 16} ${x - 4} ${y - 20} C${x - 2} ${y - 10} ${x} ${y - 6} ${x} ${y} Z" fill="${p.leaf}"/>` +
  `<path d="M${x} ${y} C${x + 14} ${y - 6} ${x + 16} ${y - 18} ${x + 5} ${y - 22} C${x + 2} ${y - 12} ${x} ${y - 6} ${x} ${y} Z" fill="${p.leaf}"/>`;

const MOTIFS: Record<Category, Motif> = {
  // A seed packet with a sprout drawn on it and seeds spilling out.
  seeds: (p) =>
    `<rect x="26" y="14" width="44" height="60" rx="3" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="26" y="14" width="44" height="10" fill="${p.accent}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="46" y="38" width="3" height="22" fill="${p.leaf}"/>` + leafPair(47.5, 42, p) +
    `<ellipse cx="30" cy="82" rx="3" ry="2" fill="${p.earth}"/><ellipse cx="40" cy="85" rx="3" ry="2" fill="${p.earth}"/><ellipse cx="60" cy="83" rx="3" ry="2" fill="${p.earth}"/>`,
  // A bulb with roots below and a shoot above.
  bulbs: (p) =>
    `<path d="M38 70 L34 84 M44 72 L44 86 M52 72 L54 86 M58 70 L62 83" stroke="${p.earth}" stroke-width="2" fill="none"/>` +
    `<path d="M48 22 C62 38 70 50 64 62 C60 72 36 72 32 62 C26 50 34 38 48 22 Z" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<path d="M48 26 C52 40 52 56 48 70" stroke="${p.accent}" stroke-width="2" fill="none"/>` +
    `<path d="M48 22 C46 14 48 8 52 4 C52 10 52 16 48 22 Z" fill="${p.leaf}"/>`,
  // A small tree: trunk and a three-lobed crown.
  'outdoor plants': (p) =>
    `<rect x="44" y="54" width="8" height="30" fill="${p.earth}"/>` +
    `<circle cx="36" cy="46" r="16" fill="${p.leaf}"/><circle cx="60" cy="46" r="16" fill="${p.leaf}"/><circle cx="48" cy="30" r="18" fill="${p.leaf}"/>` +
    `<circle cx="40" cy="36" r="3" fill="${p.accent}"/><circle cx="58" cy="42" r="3" fill="${p.accent}"/><circle cx="50" cy="24" r="3" fill="${p.accent}"/>` +
    `<rect x="20" y="84" width="56" height="4" rx="2" fill="${p.dark}" opacity="0.3"/>`,
  // A house plant: broad leaves rising from a pot.
  'indoor plants': (p) =>
    `<path d="M48 58 C30 50 20 34 26 18 C38 24 46 40 48 58 Z" fill="${p.leaf}"/>` +
    `<path d="M48 58 C66 50 76 34 70 16 C58 24 50 40 48 58 Z" fill="${p.leaf}"/>` +
    `<path d="M48 58 C44 40 44 24 50 10 C56 26 54 42 48 58 Z" fill="${p.leaf}" opacity="0.85"/>` +
    `<path d="M32 58 L64 58 L60 86 L36 86 Z" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="30" y="56" width="36" height="7" rx="2" fill="${p.accent}"/>`,
  // A hand trowel: wooden handle, metal blade.
  tools: (p) =>
    `<g transform="rotate(-35 48 48)">` +
    `<rect x="42" y="58" width="12" height="30" rx="5" fill="${p.earth}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="45" y="50" width="6" height="10" fill="${p.dark}"/>` +
    `<path d="M48 6 C64 18 64 40 56 50 L40 50 C32 40 32 18 48 6 Z" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<path d="M48 12 L48 46" stroke="${p.accent}" stroke-width="2"/></g>`,
  // A flower pot with a rim and a band.
  pots: (p) =>
    `<path d="M26 34 L70 34 L64 84 L32 84 Z" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="22" y="24" width="52" height="12" rx="2" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<path d="M29 56 L67 56 L66 64 L30 64 Z" fill="${p.accent}"/>` +
    `<ellipse cx="48" cy="26" rx="22" ry="3" fill="${p.earth}"/>`,
  // A sack of compost beside a heap.
  compost: (p) =>
    `<path d="M52 84 C50 70 52 40 56 26 L84 26 C86 40 88 70 86 84 Z" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="58" y="44" width="22" height="16" rx="2" fill="${p.accent}"/>` +
    `<path d="M8 86 C14 64 40 60 50 86 Z" fill="${p.earth}"/>` +
    `<circle cx="22" cy="76" r="2" fill="${p.dark}"/><circle cx="34" cy="72" r="2" fill="${p.dark}"/>` + leafPair(30, 66, p),
  // A watering can with its rose and drops.
  irrigation: (p) =>
    `<rect x="22" y="40" width="42" height="40" rx="6" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<path d="M64 52 L84 30 L88 34 L68 62 Z" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<path d="M30 40 C30 24 56 24 56 40" stroke="${p.dark}" stroke-width="4" fill="none"/>` +
    `<rect x="22" y="58" width="42" height="6" fill="${p.accent}"/>` +
    `<ellipse cx="88" cy="44" rx="2" ry="3" fill="${p.accent}"/><ellipse cx="84" cy="52" rx="2" ry="3" fill="${p.accent}"/>`,
  // A bird box on a post, with its round door.
  wildlife: (p) =>
    `<rect x="45" y="62" width="6" height="28" fill="${p.earth}"/>` +
    `<path d="M26 40 L48 18 L70 40 L70 66 L26 66 Z" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<path d="M20 42 L48 14 L76 42" stroke="${p.accent}" stroke-width="6" fill="none" stroke-linecap="round"/>` +
    `<circle cx="48" cy="46" r="7" fill="${p.dark}"/><rect x="46" y="56" width="4" height="6" fill="${p.earth}"/>`,
  // A garden bench.
  furniture: (p) =>
    `<rect x="14" y="30" width="68" height="8" rx="2" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="14" y="42" width="68" height="8" rx="2" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="10" y="56" width="76" height="8" rx="2" fill="${p.accent}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="18" y="64" width="6" height="22" fill="${p.dark}"/><rect x="72" y="64" width="6" height="22" fill="${p.dark}"/>` +
    `<rect x="18" y="26" width="6" height="32" fill="${p.dark}"/><rect x="72" y="26" width="6" height="32" fill="${p.dark}"/>`,
  // A lantern with a warm glow.
  lighting: (p) =>
    `<circle cx="48" cy="54" r="30" fill="${p.accent}" opacity="0.35"/>` +
    `<path d="M40 10 C40 4 56 4 56 10" stroke="${p.dark}" stroke-width="3" fill="none"/>` +
    `<path d="M34 18 L62 18 L58 26 L38 26 Z" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>` +
    `<rect x="36" y="26" width="24" height="40" fill="${p.accent}" stroke="${p.dark}" stroke-width="2"/>` +
    `<path d="M48 36 C54 44 52 54 48 56 C44 54 42 44 48 36 Z" fill="${p.main}"/>` +
    `<rect x="32" y="66" width="32" height="8" rx="2" fill="${p.main}" stroke="${p.dark}" stroke-width="2"/>`,
  // A glass cloche over a seedling.
  protection: (p) =>
    `<rect x="14" y="78" width="68" height="8" rx="2" fill="${p.earth}"/>` +
    `<rect x="46" y="60" width="3" height="18" fill="${p.leaf}"/>` + leafPair(47.5, 66, p) +
    `<path d="M20 78 L20 46 C20 22 76 22 76 46 L76 78" fill="${p.main}" fill-opacity="0.35" stroke="${p.dark}" stroke-width="2"/>` +
    `<circle cx="48" cy="22" r="5" fill="${p.accent}" stroke="${p.dark}" stroke-width="2"/>` +
    `<path d="M30 44 C30 36 36 32 40 30" stroke="#ffffff" stroke-width="3" fill="none" opacity="0.8"/>`,
};

/** The drawing of `category` in `palette`, as a whole SVG document of 96 × 96 pixels. */
export function drawing(category: Category, palette: Palette): string {
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="96" height="96" viewBox="0 0 96 96">` +
    `<rect width="96" height="96" fill="${palette.bg}"/>${MOTIFS[category](palette)}</svg>`
  );
}
