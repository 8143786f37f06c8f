/**
 * The meter's target bands as a zod schema, for the brief (stored JSON, the api, CLI flags). Each band's
 * ends must lie in the reading's range with min ≤ max (readings.ts `targetProblem`); the message names
 * the reading in words.
 */
import { z } from 'zod';
import { TARGET_KEYS, targetProblem, type Targets } from './readings.ts';

const BandSchema = z.object({ min: z.number().optional(), max: z.number().optional() }).strict();

/** The shape alone: the api takes this and lets the service say a range problem in words (InputError). */
export const TargetsShape = z
  .object(Object.fromEntries(TARGET_KEYS.map((k) => [k, BandSchema.optional()])) as Record<(typeof TARGET_KEYS)[number], z.ZodOptional<typeof BandSchema>>)
  .strict();

export const TargetsSchema = TargetsShape.superRefine((t, ctx) => {
    const problem = targetProblem(t as Targets);
  if (problem) ctx.addIssue({ code: z.ZodIssueCode.custom, message: problem });
});
