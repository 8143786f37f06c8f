import type { ParseArgsConfig } from 'node:util';
import type { HandlerTable } from '../../api/handler-table.ts';
import type { AppContext } from '../../services/context.ts';
import type { FlagFields } from './flag-fields.ts';

export type OptionSpec = NonNullable<ParseArgsConfig['options']>;
export type OptionValues = Record<string, string | boolean | string[] | boolean[] | undefined>;

/** A wrong command line (missing argument, bad flag value): exit code 1. */
export class UsageError extends Error {}

/** Exit codes: 0 ok, 1 usage (wrong command line), 2 data error (bad file, unknown id, failed rule). */
export const EXIT = { ok: 0, usage: 1, data: 2 } as const;

export interface CliIo {
  out(text: string): void;
  err(text: string): void;
  /** True when stderr is a terminal (progress bars only then). */
  errIsTty: boolean;
  /** True when stdout is a terminal: a file printed there (an export without --out) is shown escaped. */
  outIsTty?: boolean;
  /**
   * Asks a yes/no question and gives the answer line; only present when a person is at a terminal (stdin
   * and stderr both TTYs). Without it a command that must ask refuses and names the flag that answers.
   */
  ask?(question: string): Promise<string>;
}

export interface CommandEnv {
  values: OptionValues;
  positionals: string[];
  io: CliIo;
  /**
   * A file's content on stdout (an export without --out): its exact bytes when piped (`> week10.csv` keeps
   * the CSV's CRLF), escaped like every other output when stdout is a terminal.
   */
  printFile(text: string): void;
  json: boolean;
  /** The workspace path from --workspace (or its default). */
  workspace: string;
  /**
   * The handler table to call, with the workspace opened (created when `create`), or with none open when
   * `detached` (commands that make the workspace file themselves, like demo).
   */
  api(options?: { create?: boolean; detached?: boolean }): { table: HandlerTable; ctx: AppContext };
}

/**
 * One command of the command line. Commands are thin: they parse flags, call the handler table and print.
 * `name` may have two words ("edition new").
 */
export interface CliCommand {
  name: string;
  summary: string;
  /** Lines shown under "usage:" in --help, without the program name. */
  usage: string[];
  options: OptionSpec;
  /** One line per option in `options`: what it does, its values and default (shown by --help; tested). */
  about: Record<string, string>;
  /**
   * Which api request field each option fills (or `none`), so the api's refusal of a value names the flag
   * (flag-fields.ts). Declared beside `options`; every option is in it (test/cli/flag-fields.test.ts).
   */
  flagFields: FlagFields;
  /** Extra help text: how the flags combine, examples. */
  help?: string;
  run(env: CommandEnv): Promise<number>;
}
