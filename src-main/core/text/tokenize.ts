import { stemmer } from 'stemmer';
import { ENGLISH_STOP_WORDS } from './stopwords.ts';

export interface TokenizeOptions {
  /** Drop ENGLISH_STOP_WORDS. Default true. */
  stopWords?: boolean;
  /** Porter stemming (the `stemmer` package, Porter 1980). Default false: stems confuse editors reading explanations. */
  stem?: boolean;
}

/**
 * Lower-cased runs of Unicode letters and digits (marks kept with their letters, so accented words stay
 * whole). As scikit-learn's default token_pattern `(?u)\b\w\w+\b` does, single characters are dropped;
 * unlike it, the underscore separates tokens, since it is punctuation in catalogue text.
 */
const WORD = /[\p{L}\p{N}][\p{L}\p{M}\p{N}]*/gu;

export function tokenize(text: string, opts: TokenizeOptions = {}): string[] {
  const stop = opts.stopWords ?? true;
  const stem = opts.stem ?? false;
  const out: string[] = [];
  for (const m of text.toLowerCase().matchAll(WORD)) {
    const w = m[0];
    if (w.length < 2) continue;
    if (stop && ENGLISH_STOP_WORDS.has(w)) continue;
    out.push(stem ? stemmer(w) : w);
  }
  return out;
}
