import fs from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { createHandlerTable, type HandlerTable } from '../../api/handler-table.ts';
import { InputError, WorkspaceBusyError } from '../../core/errors.ts';
import { AppContext } from '../../services/context.ts';
import { sweepTempFolders } from '../../services/temp-folders.ts';
import { explainStoreError } from '../../store/store-errors.ts';
import { waitingLine } from '../../store/write-lock.ts';
import { CliApiError } from './call.ts';
import { apiRefusalWords, flagValueWords, refusalWords, SchemaRefusal } from './flag-fields.ts';
import { FlagValueError } from './flags.ts';
import { optionErrorWords } from './option-errors.ts';
import { escapeControls } from './escape.ts';
import { EXIT, UsageError, type CliCommand, type CliIo, type CommandEnv, type OptionSpec } from './command.ts';

export { UsageError };
import { COMMANDS } from './commands/index.ts';

export const DEFAULT_WORKSPACE = path.join('.workspaces', 'demo.sqlite');

const GLOBAL_OPTIONS: OptionSpec = {
  workspace: { type: 'string', short: 'w' },
  json: { type: 'boolean', default: false },
  help: { type: 'boolean', short: 'h', default: false },
};

function programHelp(): string {
  const width = Math.max(...COMMANDS.map((c) => c.name.length));
  return [
    'shelfwright: build balanced featured lists from your catalogue and its interaction history',
    '',
    'usage: shelfwright <command> [options]',
    '',
    'commands:',
    ...COMMANDS.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    '',
    'global options:',
    `  -w, --workspace PATH  the workspace file (default: $SHELFWRIGHT_WORKSPACE or ${DEFAULT_WORKSPACE})`,
    '  --json                machine-readable output on stdout; a failure too, as {"error": {...}}',
    '  -h, --help            help for any command',
    '',
    'exit codes: 0 ok, 1 usage error, 2 data error',
  ].join('\n');
}

export function commandHelp(c: CliCommand): string {
  const flags = Object.entries(c.options).map(([name, o]) => [`${o.short ? `-${o.short}, ` : '    '}--${name}${o.type === 'string' ? ' VALUE' : ''}`, c.about[name] ?? '']);
  flags.push(['-w, --workspace PATH', 'the workspace file'], ['    --json', 'machine-readable output on stdout']);
  const width = Math.max(...flags.map(([f]) => f!.length)) + 2;
  const opts = flags.map(([f, about]) => `  ${f!.padEnd(width)}${about}`.trimEnd());
  return [
    `shelfwright ${c.name}: ${c.summary}`,
    '',
    'usage:',
    ...c.usage.map((u) => `  shelfwright ${c.name} ${u}`.trimEnd()),
    '',
    'options:',
    ...opts,
    ...(c.help ? ['', c.help] : []),
  ].join('\n');
}

/**
 * Says plainly, with the next step, why a workspace path cannot be used (the store's own errors speak of
 * database files); a missing file is fine when the command creates it (import).
 */
function checkWorkspacePath(file: string, create: boolean): void {
  let st: fs.Stats | undefined;
  try {
    st = fs.statSync(file);
  } catch {
    st = undefined;
  }
  if (st?.isDirectory()) throw new InputError('this is a folder, not a workspace file: give the .sqlite file inside it', { file });
  if (!st && !create) {
    throw new InputError(
      `no workspace at ${file}: make one by importing a catalogue (shelfwright import items FILE -w ${file}) ` +
        `or build the demo shop (shelfwright demo -w ${file})`,
    );
  }
}

interface FailureDetail {
  message: string;
  code?: string;
  where?: unknown;
}

/** Reports a failure as text on stderr, or (with --json) as {"error": {...}} on stdout; returns the exit code. */
function failWith(io: CliIo, json: boolean) {
  return (exit: number, text: string, detail: FailureDetail): number => {
    if (json) io.out(JSON.stringify({ error: { exit, kind: exit === EXIT.usage ? 'usage' : 'data', ...detail } }, null, 2));
    else io.err(text);
    return exit;
  };
}

/**
 * `shelfwright -w shop.sqlite import items f.csv` is how many tools take a global option: the global options
 * written before the command move after it, where the command's parser reads them.
 */
function globalsAfterCommand(argv: string[]): string[] {
  const lead: string[] = [];
  let p = 0;
  while (p < argv.length) {
    const a = argv[p]!;
    if ((a === '-w' || a === '--workspace') && p + 1 < argv.length) {
      lead.push(a, argv[p + 1]!);
      p += 2;
    } else if (a.startsWith('--workspace=') || a === '--json') {
      lead.push(a);
      p++;
    } else break;
  }
  return [...argv.slice(p), ...lead];
}

/** Finds the longest command name (two words, then one) at the start of argv. */
function findCommand(argv: string[]): { command: CliCommand; rest: string[] } | undefined {
  for (const words of [2, 1]) {
    const name = argv.slice(0, words).join(' ');
    const command = COMMANDS.find((c) => c.name === name);
    if (command) return { command, rest: argv.slice(words) };
  }
  return undefined;
}

export async function main(argv: string[], rawIo: CliIo, env: NodeJS.ProcessEnv = process.env): Promise<number> {
  // Every line printed passes one guard (escape.ts): no command can forget it for a title or an id.
  const form = argv.includes('--json') ? 'json' : 'text';
  const io: CliIo = { ...rawIo, out: (t) => rawIo.out(escapeControls(t, form)), err: (t) => rawIo.err(escapeControls(t)) };
  const first = argv.find((a) => !a.startsWith('-'));
  if (argv.length === 0 || (first === undefined && (argv.includes('--help') || argv.includes('-h')))) {
    io.out(programHelp());
    return argv.length === 0 ? EXIT.usage : EXIT.ok;
  }
  // With --json a failure is a JSON object on stdout too (exit code unchanged), so a script reads one stream.
  const fail = failWith(io, argv.includes('--json'));
  const args = globalsAfterCommand(argv);
  const found = findCommand(args);
  if (!found) {
    const dash = args.findIndex((a) => a.startsWith('-'));
    const words = (dash < 0 ? args : args.slice(0, dash)).slice(0, 2).join(' ');
    return fail(EXIT.usage, `shelfwright: unknown command '${words}'. Run 'shelfwright --help' for the list.`, { message: `unknown command '${words}'` });
  }
  const { command, rest } = found;
  sweepTempFolders(); // what a killed earlier run left behind (services/temp-folders.ts)
  let parsed;
  try {
    parsed = parseArgs({ args: rest, options: { ...GLOBAL_OPTIONS, ...command.options }, allowPositionals: true, strict: true });
  } catch (e) {
    const known = Object.keys({ ...GLOBAL_OPTIONS, ...command.options });
    const message = optionErrorWords(e as { code?: string; message: string }, command.name, known) ?? (e as Error).message;
    return fail(EXIT.usage, `shelfwright ${command.name}: ${message}\nRun 'shelfwright ${command.name} --help'.`, { message });
  }
  const values = parsed.values as CommandEnv['values'];
  if (values['help']) {
    io.out(commandHelp(command));
    return EXIT.ok;
  }
  const workspace = (values['workspace'] as string | undefined) ?? env['SHELFWRIGHT_WORKSPACE'] ?? DEFAULT_WORKSPACE;
  // A write that must wait for another process says so on stderr, once per command (stdout stays the result).
  let waited = false;
  const onWait = (holder: string) => {
    if (!waited) io.err(waitingLine(holder));
    waited = true;
  };
  const ctx = new AppContext({ onWait });
  let table: HandlerTable | undefined;
  const cenv: CommandEnv = {
    values,
    positionals: parsed.positionals,
    io,
    printFile: (t) => (rawIo.outIsTty ? io.out(t) : rawIo.out(t)),
    json: values['json'] === true,
    workspace,
    api: (options = {}) => {
      if (!ctx.isOpen && !options.detached) {
        checkWorkspacePath(workspace, options.create ?? false);
        ctx.open(workspace, { create: options.create ?? false });
      }
      table ??= createHandlerTable(ctx);
      return { table, ctx };
    },
  };
  try {
    return await command.run(cenv);
  } catch (thrown) {
    const e = explainStoreError(thrown, workspace);
    if (e instanceof UsageError) {
      // A value the api's schema refused is said as the flag that set it (flag-fields.ts).
      if (e instanceof SchemaRefusal) e.message = refusalWords(command, values, e);
      if (e instanceof FlagValueError) e.message = flagValueWords(command, e) ?? e.message;
      return fail(EXIT.usage, `shelfwright ${command.name}: ${e.message}\nRun 'shelfwright ${command.name} --help'.`, { message: e.message });
    }
    if (e instanceof InputError) {
      return fail(EXIT.data, `shelfwright ${command.name}: ${e.describe()}`, { message: e.message, ...(Object.keys(e.where).length > 0 && { where: e.where }) });
    }
    if (e instanceof WorkspaceBusyError) {
      return fail(EXIT.data, `shelfwright ${command.name}: ${e.message}`, { code: 'conflict', message: e.message });
    }
    if (e instanceof CliApiError) {
      const { code, message, where } = e.error;
      // A service's refusal of one request field is said as the flag that filled it (exit code unchanged).
      const column = where && where.file === undefined && where.line === undefined && typeof where.column === 'string' ? where.column : undefined;
      const text = (column !== undefined && apiRefusalWords(command, values, column, e.message)) || e.message;
      return fail(EXIT.data, `shelfwright ${command.name}: ${text}`, { code, message, ...(where && { where }) });
    }
    throw e;
  } finally {
    ctx.jobs.cancelAll();
    ctx.close();
  }
}

