/**
 * Drops the keys whose value is undefined. zod's output types say `x?: T | undefined`, while our option
 * types (under exactOptionalPropertyTypes) say `x?: T`: a key is either absent or has a value.
 */
export function compact<T extends object>(o: T): { [K in keyof T]?: Exclude<T[K], undefined> } {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(o)) if (v !== undefined) out[k] = v;
  return out as { [K in keyof T]?: Exclude<T[K], undefined> };
}
