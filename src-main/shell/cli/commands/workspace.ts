import { plural } from '../../../core/util/plural.ts';
import { call } from '../call.ts';
import { EXIT, type CliCommand } from '../command.ts';

export const infoCommand: CliCommand = {
  name: 'info',
  summary: 'which workspace file is used and how much it holds',
  usage: ['[--workspace PATH] [--json]'],
  options: {},
  flagFields: {},
  about: {},
  async run(env) {
    const { table } = env.api();
    const info = await call(table, 'workspace.info', {});
    if (env.json) env.io.out(JSON.stringify(info, null, 2));
    else
      env.io.out(
        `${info.file}\n  schema ${info.schemaVersion}: ${plural(info.items, 'item')}, ${plural(info.customers, 'customer')}, ${plural(info.signals, 'signal')}`,
      );
    return EXIT.ok;
  },
};
