import { z } from 'zod';
import { SIGNAL_KINDS } from '../../core/types.ts';

/**
 * The main reason an item was proposed (core/curation/reasons.ts), as the api carries it: structured, so
 * each place says it in words with its own number format (core/curation/reason-words.ts).
 */
const Named = { item: z.string(), title: z.string() };
const count = z.number().int().min(0);

export const ReasonView = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('audience'),
    audienceSize: count,
    /** The audience is every customer of the shop. */
    everyone: z.boolean(),
    held: z.array(z.object({ ...Named, people: count, did: z.enum(SIGNAL_KINDS) })).min(1),
  }),
  z.object({
    kind: z.literal('anchor'),
    via: z.enum(['content', 'collaborative']),
    anchor: z.object(Named),
    sharedTags: z.array(z.string()),
    sameCategory: z.string().nullable(),
    sameSupplier: z.string().nullable(),
  }),
  z.object({ kind: z.literal('rising'), recent: count, previous: count, windowDays: z.number().positive(), noun: z.enum(SIGNAL_KINDS).nullable() }),
  z.object({ kind: z.literal('new'), ageDays: count }),
  z.object({ kind: z.literal('popular'), customers: count, customerCount: count }),
]);
export type ReasonView = z.infer<typeof ReasonView>;
