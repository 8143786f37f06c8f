/**
 * English function words that say nothing about what an item is about. Our own list, written for
 * catalogue text (articles, pronouns, auxiliaries, prepositions, conjunctions, quantifiers); kept short
 * on purpose, since removing a content word does more harm than keeping a function word.
 */
export const ENGLISH_STOP_WORDS: ReadonlySet<string> = new Set(
  `a about above after again against all also am an and any are as at be because been before being below
  between both but by can could did do does doing down during each either else ever every few for from
  further had has have having he her here hers herself him himself his how however i if in into is it its
  itself just least less let me more most much must my myself neither no nor not now of off on once only or
  other ought our ours ourselves out over own per rather same shall she should since so some such than that
  the their theirs them themselves then there these they this those though through thus to too under until
  up upon us very was we were what whatever when where whether which while who whom whose why will with
  within without would yet you your yours yourself yourselves`
    .split(/\s+/)
    .filter((w) => w.length > 0),
);
