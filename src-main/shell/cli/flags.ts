import { UsageError, type CommandEnv } from './command.ts';

/** Reading parsed flags with the checks every command wants; a bad value is a usage error naming the flag. */

/**
 * A number flag the command's own check refused. main() says the limit as the api's schema has it when the
 * flag fills a field and the value is past that field's limit too (flag-fields.ts), so both checks say the
 * same range; otherwise this message stands.
 */
export class FlagValueError extends UsageError {
  constructor(
    readonly flag: string,
    readonly raw: string,
    message: string,
  ) {
    super(message);
  }
}

export function str(env: CommandEnv, name: string): string | undefined {
  const v = env.values[name];
  return typeof v === 'string' ? v : undefined;
}

/** A repeatable flag's values (none → []). */
export function list(env: CommandEnv, name: string): string[] {
  const v = env.values[name];
  return Array.isArray(v) ? (v as string[]) : typeof v === 'string' ? [v] : [];
}

export function num(env: CommandEnv, name: string, check: (x: number) => boolean, what: string): number | undefined {
  const v = str(env, name);
  if (v === undefined) return undefined;
  const x = Number(v);
  if (v.trim() === '' || !Number.isFinite(x) || !check(x)) throw new FlagValueError(name, v, `--${name} must be ${what}, got '${v}'`);
  return x;
}

export const int = (env: CommandEnv, name: string, min = 1): number | undefined =>
  num(env, name, (x) => Number.isInteger(x) && x >= min, `a whole number >= ${min}`);

/** Exactly these positional arguments, in order. */
export function positionals(env: CommandEnv, names: string[]): string[] {
  if (env.positionals.length < names.length) {
    throw new UsageError(`missing ${names.slice(env.positionals.length).join(' and ')}`);
  }
  if (env.positionals.length > names.length) throw new UsageError(`unexpected argument '${env.positionals[names.length]}'`);
  return env.positionals;
}
