import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { limitWords, schemaAt } from '../../src-main/shell/cli/limit-words.ts';

/**
 * A field's limit in words, read from its zod schema (the api's request schemas are zod 4). The wording is ours
 * (common practice, no source); each expectation below is the schema's own bounds said back.
 */
describe('limitWords', () => {
  const request = z.object({
    threads: z.number().int().min(1).max(8).optional(),
    lambda: z.number().positive(),
    share: z.number().min(0).max(1).nullable(),
    below: z.number().min(0).lt(1),
    seed: z.number().int().nonnegative().default(1),
    scaling: z.enum(['linear', 'log']).optional(),
    delimiter: z.string().length(1).optional(),
    name: z.string().min(1).max(60),
    nested: z.object({ quotas: z.array(z.object({ max: z.number().int().min(1) })) }),
    action: z.discriminatedUnion('kind', [z.object({ kind: z.literal('pin'), slot: z.number().int().min(1) }), z.object({ kind: z.literal('boost'), factor: z.number().positive() })]),
  });
  const at = (...path: PropertyKey[]) => limitWords(schemaAt(request, path));

  it('says a number by its bounds, through optional, nullable and default', () => {
    expect(at('threads')).toBe('a whole number from 1 to 8');
    expect(at('lambda')).toBe('a number above 0');
    expect(at('share')).toBe('a number from 0 to 1');
    expect(at('below')).toBe('a number >= 0 and below 1');
    expect(at('seed')).toBe('a whole number >= 0');
  });

  it('says a choice and a text length', () => {
    expect(at('scaling')).toBe('linear or log');
    expect(at('delimiter')).toBe('one character');
    expect(at('name')).toBe('1 to 60 characters');
  });

  it('walks into arrays and the branches of a union', () => {
    expect(at('nested', 'quotas', 3, 'max')).toBe('a whole number >= 1');
    expect(at('action', 'slot')).toBe('a whole number >= 1');
    expect(at('action', 'factor')).toBe('a number above 0');
    expect(schemaAt(request, ['nope'])).toBeUndefined();
  });
});
