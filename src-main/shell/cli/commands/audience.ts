import type { ResponseOf } from '../../../api/contract.ts';
import { call } from '../call.ts';
import { EXIT, UsageError, type CliCommand, type CommandEnv } from '../command.ts';
import { int, positionals, str } from '../flags.ts';
import { formatNumber, table } from '../format.ts';

type Groups = ResponseOf<'audience.groups'>;

const fixed = (x: number | null) => (x === null ? '–' : x.toFixed(2));

function printGroups(env: CommandEnv, r: Groups): number {
  if (env.json) {
    env.io.out(JSON.stringify(r, null, 2));
    return EXIT.ok;
  }
  const lifts = (xs: { value: string; lift: number }[]) => xs.map((x) => `${x.value} ×${formatNumber(x.lift)}`).join(', ') || '–';
  const grouped = r.customers - r.notEnoughHistory;
  env.io.out(
    [
      `${r.k} groups, chosen in ${r.settings.minK}..${r.settings.maxK} by the ${r.criterion} (${formatNumber(r.sampled)} sampled; mean silhouette ${fixed(r.silhouette)})`,
      `${formatNumber(grouped)} customers in groups; ${formatNumber(r.notEnoughHistory)} with fewer than ${r.settings.minHistory} items: not enough history yet`,
      `silhouette by k: ${r.tried.map((t) => `${t.k}: ${t.silhouette.toFixed(3)}`).join(', ')}`,
      '',
      table(
        ['group', 'name', 'customers', 'cohesion', 'nearest (separation)', 'silhouette', 'top categories (lift)', 'top tags (lift)'],
        r.groups.map((g) => [g.group, g.name ?? '–', g.customers, fixed(g.cohesion), `${g.nearest} (${fixed(g.separation)})`, fixed(g.silhouette), lifts(g.categories), lifts(g.tags)]),
      ),
      '',
      'cohesion: mean cosine of members to their group; separation: cosine distance to the nearest group; silhouette: Rousseeuw (1987), -1..1, higher is better separated',
      ...r.unmatchedNames.map((n) => `note: the group named '${n}' is no longer found (it split, merged or dissolved); its name is kept until removed`),
    ].join('\n'),
  );
  return EXIT.ok;
}

export const audienceCommands: CliCommand[] = [
  {
    name: 'audience groups',
    summary: 'the taste groups found in the customers’ iALS factors: size, cohesion, separation, top categories and tags',
    usage: ['[--min-k N] [--max-k N] [--min-history N]'],
    options: { 'min-k': { type: 'string' }, 'max-k': { type: 'string' }, 'min-history': { type: 'string' } },
    flagFields: { 'audience.settings': { 'min-k': 'minK', 'max-k': 'maxK', 'min-history': 'minHistory' } },
    about: {
      'min-k': 'the fewest groups to consider (saved for the workspace; default 2)',
      'max-k': 'the most groups to consider (saved; default 12)',
      'min-history': 'distinct items a customer needs to join a group (saved; default 3)',
    },
    help: '  use a group in a brief with --audience group:NAME (named: followed across trainings) or group:N\n\nexamples:\n  shelfwright audience groups\n  shelfwright audience groups --min-k 4 --max-k 10',
    async run(env) {
      positionals(env, []);
      const { table: t } = env.api();
      const minK = int(env, 'min-k', 2);
      const maxK = int(env, 'max-k', 2);
      const minHistory = int(env, 'min-history', 1);
      if (minK === undefined && maxK === undefined && minHistory === undefined) return printGroups(env, await call(t, 'audience.groups', {}));
      const req: { minK?: number; maxK?: number; minHistory?: number } = {};
      if (minK !== undefined) req.minK = minK;
      if (maxK !== undefined) req.maxK = maxK;
      if (minHistory !== undefined) req.minHistory = minHistory;
      return printGroups(env, await call(t, 'audience.settings', req));
    },
  },
  {
    name: 'audience name',
    summary: 'name a taste group; the name follows its customers into later trainings',
    usage: ['GROUP NAME', '--remove NAME'],
    options: { remove: { type: 'string' } },
    flagFields: { 'audience.name': { remove: 'remove' } },
    about: { remove: 'remove this name' },
    help: 'examples:\n  shelfwright audience name 2 "Balcony growers"\n  shelfwright audience name --remove "Balcony growers"',
    async run(env) {
      const { table: t } = env.api();
      const remove = str(env, 'remove');
      if (remove !== undefined) {
        positionals(env, []);
        return printGroups(env, await call(t, 'audience.name', { remove }));
      }
      const [group, name] = positionals(env, ['GROUP', 'NAME']);
      const g = Number(group);
      if (!Number.isInteger(g) || g < 0) throw new UsageError(`GROUP must be a group number (0, 1, ...), got '${group}'`);
      return printGroups(env, await call(t, 'audience.name', { group: g, name: name! }));
    },
  },
];
