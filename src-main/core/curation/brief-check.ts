/**
 * Checks a brief before it reaches the candidates and the fill. The brief is user input (an editor's form,
 * a CLI flag, a saved file), so every problem is an InputError naming the field.
 */
import { InputError } from '../errors.ts';
import { fieldProblem } from './rule-words.ts';
import type { Brief } from './types.ts';

/** The field is said in words with its name in brackets (rule-words.ts), once: no `where.column` repeating it. */
function fail(field: string, reason: string): never {
  throw new InputError(fieldProblem(field, reason));
}

function share(field: string, v: number | undefined): void {
  if (v !== undefined && !(v >= 0 && v <= 1)) fail(field, `must be a share between 0 and 1, got ${v}`);
}

export function checkBrief(brief: Brief): void {
  if (!Number.isInteger(brief.size) || brief.size < 1) fail('size', `must be a whole number >= 1, got ${brief.size}`);
  if (!(brief.lambda >= 0 && brief.lambda <= 1)) fail('lambda', `must be between 0 and 1, got ${brief.lambda}`);
  brief.rules.quotas.forEach((q, k) => {
    if (!Number.isInteger(q.max) || q.max < 1) {
      fail(`rules.quotas[${k}].max`, `must be a whole number >= 1 (use a ban to exclude a ${q.facet}), got ${q.max}`);
    }
  });
  const p = brief.rules.promoted;
  share('rules.promoted.minCount', p.minCount);
  share('rules.promoted.maxCount', p.maxCount);
  share('rules.promoted.minExposure', p.minExposure);
  share('rules.promoted.maxExposure', p.maxExposure);
  if (p.minCount !== undefined && p.maxCount !== undefined && p.minCount > p.maxCount) {
    fail('rules.promoted.minCount', `is above maxCount (${p.minCount} > ${p.maxCount})`);
  }
  if (p.minExposure !== undefined && p.maxExposure !== undefined && p.minExposure > p.maxExposure) {
    fail('rules.promoted.minExposure', `is above maxExposure (${p.minExposure} > ${p.maxExposure})`);
  }
  if (!Number.isInteger(brief.rules.restPeriod) || brief.rules.restPeriod < 0) {
    fail('rules.restPeriod', `must be a whole number >= 0, got ${brief.rules.restPeriod}`);
  }
  const { min, max } = brief.priceBand;
  if (min !== undefined && !Number.isFinite(min)) fail('priceBand.min', `must be a number, got ${min}`);
  if (max !== undefined && !Number.isFinite(max)) fail('priceBand.max', `must be a number, got ${max}`);
  if (min !== undefined && max !== undefined && min > max) fail('priceBand.min', `is above max (${min} > ${max})`);
  if (brief.maxAgeDays !== undefined && !(brief.maxAgeDays >= 0)) {
    fail('maxAgeDays', `must be >= 0 days, got ${brief.maxAgeDays}`);
  }
}
