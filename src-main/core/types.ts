/** The workspace's vocabulary as plain types (DESIGN.md "Vocabulary"). */

export const SIGNAL_KINDS = ['view', 'basket', 'purchase', 'rating', 'read', 'click', 'other'] as const;
export type SignalKind = (typeof SIGNAL_KINDS)[number];

/** Kinds are stored as small integers in bulk arrays; this is the code of each. */
export const SIGNAL_KIND_CODE: Readonly<Record<SignalKind, number>> = {
  view: 0,
  basket: 1,
  purchase: 2,
  rating: 3,
  read: 4,
  click: 5,
  other: 6,
};

export type AttributeValue = string | number | boolean | null;

/** A catalogue entry. `id` is the workspace's own row id; `externalId` is the shop's. */
export interface Item {
  id: number;
  externalId: string;
  title: string;
  description: string;
  category: string;
  tags: string[];
  supplier: string;
  price: number | null;
  /** Unix milliseconds (UTC) of the day the item was added, or null when unknown. */
  addedAt: number | null;
  promoted: boolean;
  available: boolean;
  attributes: Record<string, AttributeValue>;
}

/** A person whose interactions we hold; identified by an external id only. */
export interface Customer {
  id: number;
  externalId: string;
  attributes: Record<string, AttributeValue>;
}

/** One interaction. `at` is unix milliseconds (UTC), or null when the source had no time. */
export interface Signal {
  customerId: number;
  itemId: number;
  kind: SignalKind;
  value: number;
  at: number | null;
}

/**
 * All signals of a workspace in columns, indexed densely for the models: `item[k]` is an index into
 * `Dataset.items`, `customer[k]` an index into `Dataset.customers`. Typed arrays so that building
 * matrices walks memory without allocating per row.
 */
export interface SignalColumns {
  length: number;
  customer: Int32Array;
  item: Int32Array;
  kind: Uint8Array;
  value: Float32Array;
  /** Unix ms; NaN where the signal has no time. */
  at: Float64Array;
}

/** What the models train on: the catalogue, the customers and their signals, densely indexed. */
export interface Dataset {
  items: Item[];
  /** Workspace row id of each dense customer index. */
  customerIds: Int32Array;
  /** External id of each dense customer index. */
  customerExternalIds: string[];
  signals: SignalColumns;
}

export const DAY_MS = 86_400_000;
