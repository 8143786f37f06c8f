/**
 * What a brief edit changed, in words, for the shelf's action log ("slots 8 → 10; at most 2 per category").
 * Only the parts an editor sets are named; a change elsewhere (weights, anchors) is said generally.
 */
import type { Brief, Quota } from './types.ts';

const list = (xs: readonly string[]) => (xs.length ? xs.join(', ') : 'any');
const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

function quotaWords(q: Quota): string {
  return q.value !== undefined ? `at most ${q.max} of the ${q.facet} ${q.value}` : `at most ${q.max} per ${q.facet}`;
}

function priceWords(p: Brief['priceBand']): string {
  if (p.min === undefined && p.max === undefined) return 'any price';
  if (p.min === undefined) return `price up to ${p.max}`;
  if (p.max === undefined) return `price from ${p.min}`;
  return `price ${p.min} to ${p.max}`;
}

export function briefChangeWords(was: Brief, now: Brief): string {
  const out: string[] = [];
  if (was.size !== now.size) out.push(`slots ${was.size} → ${now.size}`);
  for (const side of ['include', 'exclude'] as const) {
    for (const key of ['categories', 'tags', 'suppliers'] as const) {
      if (!same(was[side][key], now[side][key])) {
        out.push(`${side === 'include' ? 'only' : 'leave out'} ${key}: ${list(now[side][key])}`);
      }
    }
  }
  if (!same(was.priceBand, now.priceBand)) out.push(priceWords(now.priceBand));
  if (was.maxAgeDays !== now.maxAgeDays) out.push(now.maxAgeDays === undefined ? 'any age' : `added within ${now.maxAgeDays} days`);
  if (!same(was.rules.quotas, now.rules.quotas)) out.push(now.rules.quotas.length ? now.rules.quotas.map(quotaWords).join(', ') : 'no limits per category, supplier or tag');
  if (!same(was.rules.promoted, now.rules.promoted)) out.push('sponsored bounds');
  if (was.rules.restPeriod !== now.rules.restPeriod) out.push(`rest period ${now.rules.restPeriod}`);
  if (was.lambda !== now.lambda) out.push(`relevance against variety ${now.lambda}`);
  if (!same(was.audience, now.audience)) out.push('audience');
  if (!same(was.anchors, now.anchors)) out.push('anchors');
  if (!same(was.weights, now.weights)) out.push('weights');
  if (out.length === 0 && !same(was, now)) out.push('other settings');
  return out.length ? out.join('; ') : 'no change';
}
