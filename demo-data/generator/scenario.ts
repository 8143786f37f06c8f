/**
 * The invented shop behind the demo data: Tumblebarrow Garden Supply, an online garden-supply shop
 * with a weekly newsletter and homepage rows. Every name here is invented for the demo (no real shop,
 * brand, supplier or person). This file holds only the scenario's tables; the generators read them.
 */

export const SHOP_NAME = 'Tumblebarrow Garden Supply';
export const NEWSLETTER_NAME = 'The Tumblebarrow Weekly';

export const CATEGORIES = [
  'seeds',
  'bulbs',
  'outdoor plants',
  'indoor plants',
  'tools',
  'pots',
  'compost',
  'irrigation',
  'wildlife',
  'furniture',
  'lighting',
  'protection',
] as const;
export type Category = (typeof CATEGORIES)[number];

/**
 * Relative demand by month (January first) per category. Seeds and bulbs peak in spring; bulbs peak
 * again in autumn (planting for next spring); indoor plants in winter; furniture, lighting and
 * irrigation in summer. Illustrative shapes for a temperate northern-hemisphere shop.
 */
export const SEASON: Readonly<Record<Category, readonly number[]>> = {
  seeds: [1.2, 2.0, 2.6, 2.4, 1.6, 0.9, 0.6, 0.5, 0.6, 0.5, 0.4, 0.7],
  bulbs: [0.5, 0.9, 1.6, 1.4, 0.8, 0.4, 0.4, 1.0, 2.2, 2.4, 1.5, 0.6],
  'outdoor plants': [0.4, 0.6, 1.3, 1.9, 2.0, 1.5, 1.0, 0.8, 1.0, 0.9, 0.6, 0.4],
  'indoor plants': [1.8, 1.5, 1.1, 0.8, 0.6, 0.5, 0.5, 0.6, 0.8, 1.2, 1.7, 2.3],
  tools: [0.7, 0.9, 1.4, 1.5, 1.2, 1.0, 0.9, 0.9, 1.1, 1.2, 0.9, 1.3],
  pots: [0.6, 0.8, 1.4, 1.7, 1.6, 1.2, 0.9, 0.8, 0.8, 0.8, 0.7, 0.8],
  compost: [0.6, 1.1, 1.9, 2.0, 1.4, 0.9, 0.7, 0.7, 1.1, 1.2, 0.6, 0.4],
  irrigation: [0.3, 0.4, 0.7, 1.2, 1.8, 2.3, 2.4, 1.8, 0.8, 0.4, 0.3, 0.3],
  wildlife: [1.6, 1.3, 1.2, 1.1, 0.9, 0.7, 0.7, 0.7, 0.9, 1.1, 1.4, 1.8],
  furniture: [0.3, 0.4, 0.9, 1.5, 2.1, 2.3, 2.0, 1.3, 0.7, 0.4, 0.4, 0.6],
  lighting: [0.6, 0.5, 0.7, 1.0, 1.4, 1.6, 1.5, 1.2, 1.0, 1.0, 1.2, 1.9],
  protection: [1.2, 1.4, 1.5, 1.1, 0.8, 0.6, 0.6, 0.7, 1.1, 1.6, 1.5, 1.1],
};

/** Categories people buy again when they run out (repeat purchases). */
export const CONSUMABLE: ReadonlySet<Category> = new Set<Category>(['seeds', 'compost']);

/** Price band (lowest, highest) per category; prices are drawn log-uniformly inside it. */
export const PRICE_BAND: Readonly<Record<Category, readonly [number, number]>> = {
  seeds: [1.5, 5.5],
  bulbs: [3, 18],
  'outdoor plants': [6, 45],
  'indoor plants': [8, 65],
  tools: [7, 95],
  pots: [4, 70],
  compost: [5, 28],
  irrigation: [6, 120],
  wildlife: [4, 60],
  furniture: [35, 420],
  lighting: [9, 90],
  protection: [4, 150],
};

/** A hidden taste group: who the customers are and which categories they lean to (weights sum to ~1). */
export interface GroupSpec {
  id: string;
  name: string;
  description: string;
  /** Share of the catalogue made for this group and share of the customers in it. */
  itemShare: number;
  customerShare: number;
  categories: Readonly<Partial<Record<Category, number>>>;
  /** Tags that mark the group's items (an item gets one or two of them). */
  tags: readonly string[];
  /** Sentences for descriptions that speak to the group's use. */
  uses: readonly string[];
}

/** Several groups share categories on purpose, so groups cannot be read off the category column. */
export const GROUPS: readonly GroupSpec[] = [
  {
    id: 'balcony',
    name: 'Balcony growers',
    description: 'Grow in pots on balconies, windowsills and small yards; compact everything.',
    itemShare: 0.13,
    customerShare: 0.15,
    categories: { pots: 0.3, seeds: 0.15, 'outdoor plants': 0.15, irrigation: 0.15, lighting: 0.1, furniture: 0.1, compost: 0.05 },
    tags: ['compact', 'small-space', 'container', 'railing'],
    uses: [
      'Made for balconies, windowsills and other small spaces.',
      'Fits a narrow railing or a sunny corner of a small yard.',
      'Keeps a container garden tidy when every square metre counts.',
    ],
  },
  {
    id: 'kitchen',
    name: 'Kitchen-garden growers',
    description: 'Grow their own vegetables and herbs in beds and allotment plots.',
    itemShare: 0.15,
    customerShare: 0.17,
    categories: { seeds: 0.35, compost: 0.2, protection: 0.15, tools: 0.1, irrigation: 0.1, 'outdoor plants': 0.1 },
    tags: ['edible', 'grow-your-own', 'heirloom-style', 'harvest'],
    uses: [
      'A steady helper for raised beds and allotment plots.',
      'Good for anyone growing their own salads, beans and herbs.',
      'Helps bring in a bigger harvest from the vegetable patch.',
    ],
  },
  {
    id: 'wildlife',
    name: 'Wildlife gardeners',
    description: 'Garden for birds, bees, hedgehogs and other visitors.',
    itemShare: 0.12,
    customerShare: 0.12,
    categories: { wildlife: 0.45, 'outdoor plants': 0.2, seeds: 0.15, bulbs: 0.1, compost: 0.05, protection: 0.05 },
    tags: ['pollinator', 'bird-friendly', 'native-style', 'hedgehog'],
    uses: [
      'A welcome addition for birds, bees and hedgehogs.',
      'Brings pollinators to the garden from early spring to late summer.',
      'Gives wildlife food and shelter through the colder months.',
    ],
  },
  {
    id: 'indoor',
    name: 'Indoor-plant keepers',
    description: 'Keep houseplants in flats and offices all year round.',
    itemShare: 0.14,
    customerShare: 0.15,
    categories: { 'indoor plants': 0.45, pots: 0.2, compost: 0.15, lighting: 0.1, irrigation: 0.05, tools: 0.05 },
    tags: ['houseplant', 'low-light', 'pet-safe', 'humidity'],
    uses: [
      'Happy on a bright shelf indoors, away from cold draughts.',
      'An easy companion for houseplant collections in flats and offices.',
      'Keeps indoor jungles healthy through the darker months.',
    ],
  },
  {
    id: 'tools',
    name: 'Tool enthusiasts',
    description: 'Care about well-made tools, sharp edges and sturdy kit.',
    itemShare: 0.12,
    customerShare: 0.09,
    categories: { tools: 0.55, protection: 0.15, irrigation: 0.1, pots: 0.1, furniture: 0.05, compost: 0.05 },
    tags: ['ergonomic', 'forged', 'carbon-steel', 'sharpening'],
    uses: [
      'Built to last for years of digging, cutting and pruning.',
      'Balanced in the hand and easy to keep sharp.',
      'Heavy-duty kit for gardeners who work the ground every week.',
    ],
  },
  {
    id: 'borders',
    name: 'Border planters',
    description: 'Plan flower borders around bulbs and perennials for colour through the year.',
    itemShare: 0.12,
    customerShare: 0.12,
    categories: { bulbs: 0.4, 'outdoor plants': 0.3, compost: 0.1, tools: 0.1, protection: 0.1 },
    tags: ['spring-colour', 'autumn-planting', 'cut-flower', 'perennial'],
    uses: [
      'Fills a border with colour from spring to the first frosts.',
      'Lovely in drifts along a path or massed in a border.',
      'Gives plenty of stems for cutting and bringing indoors.',
    ],
  },
  {
    id: 'patio',
    name: 'Patio hosts',
    description: 'Use the garden as an outdoor room for long evenings with friends.',
    itemShare: 0.11,
    customerShare: 0.1,
    categories: { furniture: 0.4, lighting: 0.3, pots: 0.15, 'outdoor plants': 0.1, wildlife: 0.05 },
    tags: ['outdoor-living', 'evening', 'weatherproof', 'entertaining'],
    uses: [
      'Turns a patio into an outdoor room for long evenings.',
      'Ready for summer gatherings and lazy weekend mornings outside.',
      'Sets the mood on a terrace after dark.',
    ],
  },
  {
    id: 'waterwise',
    name: 'Water-wise gardeners',
    description: 'Save water with drip lines, mulch and drought-tolerant planting.',
    itemShare: 0.11,
    customerShare: 0.1,
    categories: { irrigation: 0.4, 'outdoor plants': 0.2, compost: 0.2, tools: 0.1, protection: 0.1 },
    tags: ['drought-tolerant', 'water-saving', 'mulch', 'low-maintenance'],
    uses: [
      'Saves water in dry spells by putting it where roots need it.',
      'Part of a low-maintenance garden that copes with hot summers.',
      'Keeps soil moist for longer with less work.',
    ],
  },
];

/** Tags that describe what an item is, whoever buys it (an item gets one of its category's). */
export const CATEGORY_TAGS: Readonly<Record<Category, readonly string[]>> = {
  seeds: ['sow-indoors', 'sow-direct', 'organic'],
  bulbs: ['naturalising', 'fragrant'],
  'outdoor plants': ['shrub', 'evergreen', 'hardy'],
  'indoor plants': ['air-purifying', 'trailing'],
  tools: ['hand-tool', 'long-handled'],
  pots: ['terracotta', 'frost-proof', 'recycled'],
  compost: ['peat-free', 'feed'],
  irrigation: ['hose', 'timer'],
  wildlife: ['feeder', 'nesting'],
  furniture: ['folding', 'hardwood'],
  lighting: ['solar', 'led'],
  protection: ['frost-protection', 'pest-barrier'],
};

/** Tags any item may carry. */
export const GENERAL_TAGS: readonly string[] = ['gift-idea', 'new-season', 'bundle'];

export const REGIONS: readonly string[] = ['north', 'south', 'east', 'west', 'coast', 'city', 'uplands', 'islands'];

/** Invented suppliers and the categories each one sells. */
export const SUPPLIERS: ReadonlyArray<{ name: string; categories: readonly Category[] }> = [
  { name: 'Briarwick Seed Co.', categories: ['seeds'] },
  { name: 'Oddacre Seeds', categories: ['seeds', 'bulbs'] },
  { name: 'Pennyfold Heritage Seeds', categories: ['seeds'] },
  { name: 'Quillmoor Bulbs', categories: ['bulbs'] },
  { name: 'Hollowmere Bulb Farm', categories: ['bulbs', 'outdoor plants'] },
  { name: 'Loamridge Growers', categories: ['outdoor plants'] },
  { name: 'Cindervale Nursery', categories: ['outdoor plants', 'indoor plants'] },
  { name: 'Fernlantern Houseplants', categories: ['indoor plants'] },
  { name: 'Greenloft Plant Studio', categories: ['indoor plants', 'pots'] },
  { name: 'Fernhallow Tools', categories: ['tools'] },
  { name: 'Anvilbrook Forge', categories: ['tools'] },
  { name: 'Stoatley Implements', categories: ['tools', 'protection'] },
  { name: 'Thornapple Pottery', categories: ['pots'] },
  { name: 'Clayhythe Planters', categories: ['pots'] },
  { name: 'Mossbank Composts', categories: ['compost'] },
  { name: 'Wormwell Soil Works', categories: ['compost'] },
  { name: 'Rillstone Irrigation', categories: ['irrigation'] },
  { name: 'Dewpond Water Supply', categories: ['irrigation'] },
  { name: 'Wrenfield Wildlife Care', categories: ['wildlife'] },
  { name: 'Hedgerow & Hatch', categories: ['wildlife'] },
  { name: 'Kettleby Outdoor', categories: ['furniture'] },
  { name: 'Sallowbeck Timber', categories: ['furniture'] },
  { name: 'Lanternmoor Lighting', categories: ['lighting'] },
  { name: 'Glimmerstead', categories: ['lighting', 'furniture'] },
  { name: 'Frostguard Covers', categories: ['protection'] },
  { name: 'Netherby Cloches', categories: ['protection'] },
  { name: 'Tumblebarrow Own Range', categories: ['tools', 'pots', 'compost', 'seeds'] },
  { name: 'Ploverdale Garden Goods', categories: ['irrigation', 'protection', 'tools'] },
  { name: 'Marrowgate Supply', categories: ['compost', 'wildlife', 'pots'] },
  { name: 'Brindlecombe Crafts', categories: ['pots', 'wildlife', 'lighting'] },
];
