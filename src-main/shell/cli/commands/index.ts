import type { CliCommand } from '../command.ts';
import { audienceCommands } from './audience.ts';
import { exportSignalsCommand, importModelCommand } from './cluster.ts';
import { curationCommands } from './curation.ts';
import { demoCommand, importCommand, statsCommand } from './data.ts';
import { modelCommands } from './models.ts';
import { planningCommands } from './planning.ts';
import { infoCommand } from './workspace.ts';

/** Every command of the command line, in the order --help lists them. Areas append their lists. */
export const COMMANDS: readonly CliCommand[] = [
  infoCommand,
  importCommand,
  importModelCommand,
  exportSignalsCommand,
  statsCommand,
  demoCommand,
  ...modelCommands,
  ...curationCommands,
  ...audienceCommands,
  ...planningCommands,
];
