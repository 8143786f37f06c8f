import type { ShelfView } from '../../../api/contracts/curation.ts';
import {
  describeBand,
  formatRange,
  READINGS,
  readingRows,
  TARGET_KEYS,
  type Band,
  type BandSource,
  type TargetKey,
  type Targets,
} from '../../../core/curation/readings.ts';
import type { Brief } from '../../../core/curation/types.ts';
import { call } from '../call.ts';
import { EXIT, UsageError, type CliCommand, type OptionSpec } from '../command.ts';
import { list, positionals, str } from '../flags.ts';
import { table } from '../format.ts';

/**
 * The meter on the command line, by the reading names of core/curation/readings.ts (the app's names), and
 * `shelf targets`, which sets the meter's target bands on a shelf's brief.
 */

/** The flag of each reading with a target: its name in kebab case ("Price of choices" → --price-of-choices). */
export const TARGET_FLAGS: Record<TargetKey, string> = Object.fromEntries(
  TARGET_KEYS.map((k) => [k, READINGS[k].name.toLowerCase().replace(/[^a-z0-9]+/g, '-')]),
) as Record<TargetKey, string>;

const STATUS_WORDS = { below: 'below target', within: 'on target', above: 'above target', 'no target': '', 'no data': 'no data' } as const;

/** One row per reading: name, value, range, band in words and where the value stands. */
export function renderMeter(v: Pick<ShelfView, 'meter' | 'brief'>): string {
  const m = v.meter;
  const brief: BandSource = v.brief;
  const rows = readingRows(m, brief).map((r) => [r.name, r.text, r.range, r.targetText, STATUS_WORDS[r.status]]);
  const sat =
    m.saturatedSlots.length > 0
      ? `\n${m.saturatedSlots.length === 1 ? 'Slot' : 'Slots'} ${m.saturatedSlots.join(', ')}: most of this audience already has ${m.saturatedSlots.length === 1 ? 'this item' : 'these items'}.`
      : '';
  return `${table(['reading', 'value', 'range', 'target', 'now'], rows)}${sat}`;
}

/** A band from a flag: MIN:MAX with either end left out ("0.4:", ":5%"), or "none"; shares may be written as 5%. */
export function parseBand(flag: string, text: string, unit: 'score' | 'share' | 'days'): Band {
  const t = text.trim();
  if (t === 'none') return {};
  const m = /^([^:]*):([^:]*)$/.exec(t);
  if (!m) throw new UsageError(`--${flag} expects MIN:MAX (either end may be left out, e.g. 0.4: or :5%) or none, got '${text}'`);
  const end = (s: string): number | undefined => {
    const x = s.trim();
    if (x === '') return undefined;
    const percent = x.endsWith('%');
    if (percent && unit !== 'share') throw new UsageError(`--${flag} is not a share: give a plain number, got '${x}'`);
    const n = Number(percent ? x.slice(0, -1) : x);
    if (!Number.isFinite(n)) throw new UsageError(`--${flag}: '${x}' is not a number`);
    return percent ? n / 100 : n;
  };
  const band: Band = {};
  const lo = end(m[1] as string);
  const hi = end(m[2] as string);
  if (lo !== undefined) band.min = lo;
  if (hi !== undefined) band.max = hi;
  if (lo === undefined && hi === undefined) throw new UsageError(`--${flag}: give at least one end, or none for no target`);
  return band;
}

const OPTIONS: OptionSpec = {
  ...Object.fromEntries(TARGET_KEYS.map((k) => [TARGET_FLAGS[k], { type: 'string' as const }])),
  default: { type: 'string', multiple: true },
};

const ABOUT: Record<string, string> = {
  ...Object.fromEntries(
    TARGET_KEYS.map((k) => {
      const s = READINGS[k];
      const d = describeBand(s, s.defaultBand);
      return [TARGET_FLAGS[k], `${s.name} (${formatRange(s)}): MIN:MAX, MIN: or :MAX, or none (default: ${d === 'no target' ? 'none' : d.replace('target ', '')})`];
    }),
  ),
  default: 'repeatable: a reading whose target goes back to its default (its flag name, or all)',
};

export const meterCommands: CliCommand[] = [
  {
    name: 'shelf targets',
    summary: "set the meter's target bands on a shelf (the list stays as it is)",
    usage: [`EDITION SHELF ${TARGET_KEYS.map((k) => `[--${TARGET_FLAGS[k]} MIN:MAX]`).join(' ')} [--default NAME|all]...`],
    options: OPTIONS,
    // Each reading's flag fills targets.<reading> (a band: its min and max say the reading's range).
    flagFields: { 'shelf.targets': Object.fromEntries(TARGET_KEYS.map((k) => [TARGET_FLAGS[k], `targets.${k}`])), none: ['default'] },
    about: ABOUT,
    help: [
      "Flags left out keep the shelf's current band. Shares take 0.05 or 5%; median age takes days. The sponsored",
      "shares' band is the brief's sponsored limits (shelf brief --promoted-min/--promoted-max).",
      '',
      'examples:',
      '  shelfwright shelf targets "week 10" Front --variety 0.4: --price-of-choices :5%',
      '  shelfwright shelf targets "week 10" Front --novelty none --default calibration-gap',
    ].join('\n'),
    async run(env) {
      const [edition, shelf] = positionals(env, ['EDITION', 'SHELF']);
      const { table: t } = env.api();
      const current = await call(t, 'shelf.show', { edition: edition!, shelf: shelf! });
      const targets: Targets = { ...((current.brief as unknown as Brief).targets ?? {}) };
      const byFlag = new Map(TARGET_KEYS.map((k) => [TARGET_FLAGS[k], k]));
      for (const d of list(env, 'default')) {
        if (d === 'all') for (const k of TARGET_KEYS) delete targets[k];
        else {
          const k = byFlag.get(d);
          if (!k) throw new UsageError(`--default expects one of ${[...byFlag.keys()].join(', ')} or all, got '${d}'`);
          delete targets[k];
        }
      }
      let changed = list(env, 'default').length > 0;
      for (const k of TARGET_KEYS) {
        const text = str(env, TARGET_FLAGS[k]);
        if (text === undefined) continue;
        targets[k] = parseBand(TARGET_FLAGS[k], text, READINGS[k].unit);
        changed = true;
      }
      if (!changed) throw new UsageError(`give at least one target, e.g. --${TARGET_FLAGS.intraListDistance} 0.4:`);
      const v = await call(t, 'shelf.targets', { edition: edition!, shelf: shelf!, targets });
      env.io.out(env.json ? JSON.stringify(v, null, 2) : `${v.edition} / ${v.label}: targets set\n${renderMeter(v)}`);
      return EXIT.ok;
    },
  },
];
