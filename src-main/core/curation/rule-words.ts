/**
 * The brief's fields and rules in words, in one place: api errors (zod issues and brief checks), the
 * command line and the app all say "Most sponsored share of slots (maxCount)" where a program would say
 * `rules.promoted.maxCount`. The field's own name follows in brackets so a reader of the JSON can find it.
 */
import { EXCLUSION_WORDS } from './exclusion-words.ts';
import type { Brief } from './types.ts';

const FACET_PLURAL: Record<string, string> = { categories: 'categories', tags: 'tags', suppliers: 'suppliers' };
const WEIGHT: Record<string, string> = {
  content: 'likeness to the anchors by content',
  collaborative: 'likeness to the anchors by what people did',
  audience: "the audience's taste",
  popularity: 'popularity',
  trend: 'rising interest',
  freshness: 'newness',
};

/** A path as zod or a check names it ('brief.rules.quotas[0].max', ['rules','quotas',0,'max']) as parts. */
function partsOf(path: string | readonly PropertyKey[]): string[] {
  const parts = typeof path === 'string' ? path.replace(/\[(\d+)\]/g, '.$1').split('.') : path.map((p) => String(p));
  const out = parts.filter((p) => p !== '');
  // A request nests the brief under `brief`; the words are the same wherever it sits.
  return out[0] === 'brief' ? out.slice(1) : out;
}

/** Words for one field of a brief, or null when the path is not a brief field. */
export function fieldWords(path: string | readonly PropertyKey[]): string | null {
  const p = partsOf(path);
  const [a, b, c, d] = p;
  const n = (k: string | undefined) => Number(k) + 1;
  switch (a) {
    case 'size':
      return 'Slots (size)';
    case 'lambda':
      return 'Relevance against variety (lambda)';
    case 'anchors':
      return b === undefined ? 'Anchors (anchors)' : `Anchor ${n(b)} (anchors)`;
    case 'audience':
      if (b === 'category') return 'Audience: bought in the category (category)';
      if (b === 'withinDays') return 'Audience: within how many days (withinDays)';
      if (b === 'signalKinds') return 'Audience: which kinds of signal (signalKinds)';
      if (b === 'group' || b === 'name') return `Audience: taste group (${b})`;
      return 'Audience (audience)';
    case 'include':
    case 'exclude': {
      const what = FACET_PLURAL[b ?? ''];
      if (!what) return a === 'include' ? 'Only items of (include)' : 'Leave out items of (exclude)';
      const head = a === 'include' ? `Only these ${what}` : `Leave out these ${what}`;
      return c === undefined ? `${head} (${b})` : `${head}, entry ${n(c)} (${b})`;
    }
    case 'priceBand':
      if (b === 'min') return 'Lowest price (min)';
      if (b === 'max') return 'Highest price (max)';
      return 'Price band (priceBand)';
    case 'maxAgeDays':
      return 'Added within the last days (maxAgeDays)';
    case 'weights':
      return b && WEIGHT[b] ? `Weight of ${WEIGHT[b]} (${b})` : 'Weights (weights)';
    case 'rules':
      if (b === 'quotas') {
        if (c === undefined) return 'Most items per category, supplier or tag (quotas)';
        if (d === 'max') return `Limit ${n(c)}: most items (max)`;
        if (d === 'facet') return `Limit ${n(c)}: category, supplier or tag (facet)`;
        if (d === 'value') return `Limit ${n(c)}: which one (value)`;
        return `Limit ${n(c)} (quotas)`;
      }
      if (b === 'promoted') {
        if (c === 'minCount') return 'Least sponsored share of slots (minCount)';
        if (c === 'maxCount') return 'Most sponsored share of slots (maxCount)';
        if (c === 'minExposure') return 'Least sponsored share of exposure (minExposure)';
        if (c === 'maxExposure') return 'Most sponsored share of exposure (maxExposure)';
        return 'Sponsored bounds (promoted)';
      }
      if (b === 'restPeriod') return 'Rest period in published editions (restPeriod)';
      if (b === 'allowRepeatInEdition') return 'The same item on two shelves of an edition (allowRepeatInEdition)';
      return 'Rules (rules)';
    default:
      return null;
  }
}

/** The minimal shape of a zod issue this needs (zod 4's issue objects carry these fields by code). */
export interface IssueLike {
  code?: string;
  path: readonly PropertyKey[];
  message: string;
  minimum?: number | bigint;
  maximum?: number | bigint;
  inclusive?: boolean;
  expected?: string;
  keys?: readonly string[];
  values?: readonly unknown[];
  origin?: string;
}

const TYPE_WORDS: Record<string, string> = {
  number: 'a number',
  string: 'text',
  int: 'a whole number',
  boolean: 'yes or no',
  array: 'a list',
  object: 'a group of fields',
};

/** One schema issue in words: what the field is, and what it must be. */
export function issueWords(issue: IssueLike): string {
  const field = fieldWords(issue.path);
  const what = field ?? (issue.path.length ? issue.path.map(String).join('.') : '');
  let must: string;
  switch (issue.code) {
    case 'too_big':
      must =
        issue.origin === 'array'
          ? `may hold at most ${String(issue.maximum)}`
          : `must be at most ${String(issue.maximum)}${issue.inclusive === false ? ' (not equal)' : ''}`;
      break;
    case 'too_small':
      must =
        issue.origin === 'array' || issue.origin === 'string'
          ? issue.minimum === 1 || issue.minimum === 1n
            ? 'must not be empty'
            : `needs at least ${String(issue.minimum)}`
          : `must be at least ${String(issue.minimum)}${issue.inclusive === false ? ' (not equal)' : ''}`;
      break;
    case 'invalid_type':
      must = `must be ${TYPE_WORDS[issue.expected ?? ''] ?? issue.expected ?? 'something else'}`;
      break;
    case 'unrecognized_keys':
      must = `has no field ${(issue.keys ?? []).map((k) => `'${k}'`).join(', ')}`;
      break;
    case 'invalid_value':
      must = `must be one of ${(issue.values ?? []).map((v) => String(v)).join(', ')}`;
      break;
    default:
      must = issue.message;
  }
  // A custom message (e.g. "name the edition") already says what to do.
  if (issue.code === 'too_small' && issue.origin === 'string' && !/^Too small/.test(issue.message)) must = issue.message;
  return what ? `${what}: ${must}` : must;
}

/** A brief check's complaint about a field: its words, then the reason. */
export function fieldProblem(path: string, reason: string): string {
  return `${fieldWords(path) ?? path}: ${reason}`;
}

const QUOTA = /^quota (category|supplier|tag)(?:=(.*))? max (\d+)$/;

/**
 * A rule the fill reports (RuleViolation.rule, ListChanges' `why`) in words, with the brief's numbers:
 * `promoted.maxCount` on a shelf of 8 with a 25% bound is "At most 2 sponsored items (maxCount)".
 * Counts follow the fill's own rounding (fill.ts: floor of share × size for a ceiling, ceil for a floor).
 */
export function ruleWords(rule: string, brief: Pick<Brief, 'size' | 'rules'>): string {
  const p = brief.rules.promoted;
  const pct = (x: number | undefined) => `${Math.round((x ?? 0) * 1000) / 10}%`;
  const items = (k: number) => `${k} sponsored item${k === 1 ? '' : 's'}`;
  const EPS = 1e-9;
  switch (rule) {
    case 'promoted.maxCount':
      return `At most ${items(Math.floor((p.maxCount ?? 1) * brief.size + EPS))} (maxCount)`;
    case 'promoted.minCount':
      return `At least ${items(Math.ceil((p.minCount ?? 0) * brief.size - EPS))} (minCount)`;
    case 'promoted.maxExposure':
      return `Sponsored items take at most ${pct(p.maxExposure)} of the exposure (maxExposure)`;
    case 'promoted.minExposure':
      return `Sponsored items take at least ${pct(p.minExposure)} of the exposure (minExposure)`;
    case 'pin':
      return 'Pinned items (pin)';
    case 'size':
      return `Every one of the ${brief.size} slots filled (size)`;
    case 'audience':
      return 'The audience (audience)';
    case 'anchors':
      return 'The anchors (anchors)';
  }
  // Why an item left the pool (a filter, a ban, stock): the pool's own words.
  if (Object.hasOwn(EXCLUSION_WORDS, rule)) return EXCLUSION_WORDS[rule as keyof typeof EXCLUSION_WORDS];
  const q = QUOTA.exec(rule);
  if (q) {
    const [, facet, value, max] = q;
    const k = Number(max);
    return value !== undefined
      ? `At most ${k} item${k === 1 ? '' : 's'} of the ${facet} ${value} (quota)`
      : `At most ${k} item${k === 1 ? '' : 's'} per ${facet} (quota)`;
  }
  return rule;
}
