/**
 * Word lists that titles and descriptions are composed from, so that text similarity (TF-IDF) has
 * real words to work with: nouns by category, materials, care notes and seasonal advice.
 * Plant names are common names of plant kinds; cultivar-like names are invented by joining parts.
 */
import type { Category } from './scenario.ts';

/** What an item is, by category. */
export const NOUNS: Readonly<Record<Category, readonly string[]>> = {
  seeds: ['Tomato', 'Basil', 'Carrot', 'Runner Bean', 'Lettuce', 'Sweet Pea', 'Sunflower', 'Cornflower', 'Poppy',
    'Wildflower Meadow Mix', 'Chilli', 'Courgette', 'Radish', 'Parsley', 'Coriander', 'Kale', 'Beetroot',
    'Marigold', 'Nasturtium', 'Foxglove', 'Salad Leaf Mix', 'Pea'],
  bulbs: ['Tulip', 'Daffodil', 'Allium', 'Crocus', 'Snowdrop', 'Dahlia', 'Gladiolus', 'Iris', 'Hyacinth',
    'Lily', 'Anemone', 'Camassia', 'Grape Hyacinth', 'Fritillary'],
  'outdoor plants': ['Lavender', 'Rosemary', 'Salvia', 'Hardy Geranium', 'Echinacea', 'Fern', 'Hosta',
    'Heuchera', 'Thyme', 'Verbena', 'Butterfly Bush', 'Strawberry Plants', 'Blueberry Bush', 'Ornamental Grass',
    'Sedum', 'Climbing Rose'],
  'indoor plants': ['Monstera', 'Pothos', 'Snake Plant', 'Peace Lily', 'Fiddle-leaf Fig', 'Calathea',
    'Rubber Plant', 'Spider Plant', 'ZZ Plant', 'Aloe', 'Cactus Trio', 'Moth Orchid', 'String of Pearls',
    'Maidenhair Fern', 'Parlour Palm'],
  tools: ['Trowel', 'Hand Fork', 'Pruning Shears', 'Loppers', 'Spade', 'Border Fork', 'Dutch Hoe', 'Rake',
    'Dibber', 'Hedge Shears', 'Weeding Knife', 'Soil Knife', 'Bulb Planter', 'Potting Scoop', 'Kneeler',
    'Sharpening Stone', 'Transplanting Trowel'],
  pots: ['Terracotta Pot', 'Glazed Planter', 'Window Box', 'Railing Planter', 'Hanging Basket', 'Grow Bag',
    'Self-watering Pot', 'Seed Tray', 'Trough', 'Plant Stand', 'Pot Saucer Set', 'Herb Planter'],
  compost: ['Multipurpose Compost', 'Seed and Cutting Compost', 'Houseplant Mix', 'Leaf Mould', 'Worm Castings',
    'Bark Mulch', 'Tomato Feed', 'Seaweed Feed', 'Pelleted Manure', 'Perlite', 'Orchid Bark', 'Cactus Grit'],
  irrigation: ['Watering Can', 'Soaker Hose', 'Drip Kit', 'Hose Reel', 'Spray Nozzle', 'Water Butt',
    'Watering Timer', 'Capillary Mat', 'Watering Spikes', 'Rain Gauge', 'Mister', 'Hose Connector Set'],
  wildlife: ['Bird Feeder', 'Nest Box', 'Bee Hotel', 'Hedgehog House', 'Bird Bath', 'Suet Cakes',
    'Sunflower Hearts', 'Bug Hotel', 'Butterfly Feeder', 'Bat Box', 'Frog Shelter', 'Mealworm Mix'],
  furniture: ['Bistro Set', 'Folding Chair', 'Bench', 'Lounger', 'Parasol', 'Side Table', 'Cushion Set',
    'Storage Box', 'Hammock', 'Corner Sofa', 'Dining Table', 'Footstool'],
  lighting: ['String Lights', 'Lantern', 'Spotlight', 'Festoon Lights', 'Path Lights', 'Fire Bowl',
    'Candle Lantern', 'Grow Light', 'Wall Light', 'Post Light'],
  protection: ['Fleece Jacket', 'Cloche', 'Cold Frame', 'Mini Greenhouse', 'Insect Netting', 'Slug Barrier',
    'Plant Supports', 'Bamboo Canes', 'Bird Netting', 'Frost Cover', 'Plant Ties', 'Shade Cloth'],
};

/** Categories whose items are living things or seeds get invented variety names; the rest get makers' words. */
export const LIVING: ReadonlySet<Category> = new Set<Category>(['seeds', 'bulbs', 'outdoor plants', 'indoor plants']);

export const VARIETY_START: readonly string[] = ['Amber', 'Copper', 'Silver', 'Moon', 'Dawn', 'Velvet', 'Ember',
  'Frost', 'Honey', 'Meadow', 'Willow', 'Saffron', 'Indigo', 'Pebble', 'Thistle', 'Marsh', 'Rowan', 'Briar'];
export const VARIETY_END: readonly string[] = ['glow', 'light', 'crest', 'field', 'vale', 'mist', 'star',
  'brook', 'song', 'drift', 'flare', 'wick'];

export const MAKER_WORDS: readonly string[] = ['Ash-handled', 'Stainless', 'Carbon-steel', 'Recycled', 'Galvanised',
  'Oak', 'Enamel', 'Compact', 'Heavy-duty', 'Lightweight', 'Folding', 'Weatherproof', 'Slate-grey', 'Sage'];
export const MODEL_WORDS: readonly string[] = ['', '', '', 'Classic', 'Pro', 'Mini', 'Large', 'Twin Pack', 'Deluxe'];

/** First sentence: what it is made of or how it comes. `{n}` is replaced by the lower-cased noun. */
export const MATERIAL_SENTENCES: Readonly<Record<Category, readonly string[]>> = {
  seeds: ['A packet of {n} seed, cleaned and tested for good germination.', 'Open-pollinated {n} seed in a resealable foil packet.', 'Pelleted {n} seed that is easy to space out by hand.'],
  bulbs: ['Top-size {n} bulbs, graded and packed in a breathable mesh bag.', 'Firm {n} bulbs lifted last season and dried slowly.', 'A bag of {n} bulbs in mixed shades.'],
  'outdoor plants': ['A well-rooted {n} grown in peat-free compost in a recyclable pot.', 'Young {n} plants, hardened off outdoors before dispatch.', 'A bushy {n} in a two-litre pot.'],
  'indoor plants': ['A healthy {n} in a plastic nursery pot, ready to drop into a cover pot.', 'A glossy-leaved {n} raised in a heated glasshouse.', 'A compact {n} with several growing points.'],
  tools: ['A {n} with a forged steel head and an ash handle.', 'A {n} with a stainless blade and a soft-grip handle.', 'A {n} made from hardened carbon steel with a riveted handle.'],
  pots: ['A {n} made from frost-resistant clay with a drainage hole.', 'A {n} moulded from recycled plastic with a stone finish.', 'A glazed stoneware {n} fired at high temperature.'],
  compost: ['A bag of peat-free {n} made from composted bark and green waste.', 'A fine, crumbly {n} with added seaweed.', 'A {n} blended for steady, slow-release feeding.'],
  irrigation: ['A {n} made from UV-stable plastic with brass fittings.', 'A {n} with a kink-resistant hose and leak-proof connectors.', 'A galvanised metal {n} with a long reach.'],
  wildlife: ['A {n} made from sustainably sourced timber.', 'A powder-coated metal {n} that squirrels find hard to raid.', 'A {n} with a weatherproof roof and easy-clean base.'],
  furniture: ['A {n} made from oiled hardwood with stainless fixings.', 'A powder-coated steel {n} with a weatherproof finish.', 'A {n} woven from all-weather rattan-style fibre.'],
  lighting: ['A {n} with warm-white LEDs and a small solar panel.', 'A {n} made from black steel with a frosted glass shade.', 'A low-voltage {n} with a plug-in transformer.'],
  protection: ['A {n} made from lightweight, breathable fabric.', 'A {n} with a galvanised frame and clear polycarbonate panels.', 'A reusable {n} that packs flat for storage.'],
};

/** Sentences any item of the category may carry instead of a group's use sentence. */
export const CATEGORY_USES: Readonly<Record<Category, readonly string[]>> = {
  seeds: ['Sow thinly and thin out seedlings for strong plants.'],
  bulbs: ['Plant at three times the bulb depth in well-drained soil.'],
  'outdoor plants': ['Plant in full sun or light shade and water in well.'],
  'indoor plants': ['Water when the top of the compost feels dry.'],
  tools: ['Clean and oil the blade after use to keep it in good order.'],
  pots: ['Add a layer of grit at the bottom for drainage.'],
  compost: ['Mix into beds or use straight from the bag for containers.'],
  irrigation: ['Connects to a standard outdoor tap.'],
  wildlife: ['Place somewhere quiet and out of reach of cats.'],
  furniture: ['Cover or store indoors over winter to extend its life.'],
  lighting: ['Charges in daylight and switches on at dusk.'],
  protection: ['Pin down the edges to keep out wind and pests.'],
};

/** Seasonal advice per category, the third sentence of many descriptions. */
export const SEASON_SENTENCES: Readonly<Record<Category, readonly string[]>> = {
  seeds: ['Sow under cover in early spring or outdoors from late spring.', 'Sow from March to June for a summer harvest.'],
  bulbs: ['Plant in autumn for flowers next spring.', 'Plant in spring for flowers in late summer.'],
  'outdoor plants': ['Best planted in spring or early autumn while the soil is warm.'],
  'indoor plants': ['Brings green indoors through the winter months.', 'Grows steadily from spring and rests in winter.'],
  tools: ['Ready for spring digging and autumn clearing.'],
  pots: ['Plant up in spring for a summer display.'],
  compost: ['Use in spring when sowing and potting on, and again in autumn as a mulch.'],
  irrigation: ['Most useful from late spring through the summer heat.'],
  wildlife: ['Most needed in winter when natural food is scarce.', 'Put up in late winter before the nesting season.'],
  furniture: ['Made for summer on the patio.'],
  lighting: ['Brightens long summer evenings and dark winter afternoons.'],
  protection: ['Protects tender plants from late frosts in spring and early winter.'],
};

/** Words some titles borrow from the group they were made for (group id -> words). */
export const GROUP_TITLE_WORDS: Readonly<Record<string, readonly string[]>> = {
  balcony: ['Balcony', 'Windowsill'],
  kitchen: ['Allotment', 'Veg Patch'],
  wildlife: ['Wildlife', 'Pollinator'],
  indoor: ['Indoor', 'Shelf'],
  tools: ['Professional', 'Forged'],
  borders: ['Border', 'Cutting Garden'],
  patio: ['Patio', 'Terrace'],
  waterwise: ['Water-saving', 'Dry Garden'],
};
