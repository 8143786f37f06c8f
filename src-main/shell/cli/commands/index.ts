import type { CliCommand } from '../command.ts';
import { infoCommand } from './workspace.ts';

/** Every command of the command line, in the order --help lists them. Areas append their lists. */
export const COMMANDS: readonly CliCommand[] = [infoCommand];
