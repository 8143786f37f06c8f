/**
 * Models and evaluation metrics in an editor's words: what each model is, and what each metric measures in
 * one line. The method's own name stays beside the words (DESIGN.md: published methods keep their names).
 * One place for the screens and the command line.
 */
const MODELS: Readonly<Record<string, string>> = {
  content: 'Alike in words and attributes (content, TF-IDF)',
  itemknn: 'Chosen together by the same customers (item-kNN)',
  ials: 'Taste patterns across all customers (iALS matrix factorisation)',
  ease: 'Items that predict one another (EASE)',
  hybrid: 'The blend the shelves use (validated hybrid)',
  popularity: 'Most customers first (popularity baseline)',
  random: 'Random order (baseline)',
};

/** A model's name in words; an unknown name is shown as it is, never guessed at. */
export function modelWords(model: string): string {
  return MODELS[model] ?? model;
}

/** What each evaluation metric measures, one line each, for a list of length K. */
export function metricHelp(k: number): readonly { metric: string; help: string }[] {
  return [
    {
      metric: `NDCG@${k}`,
      help: `how high in the first ${k} the items customers went on to use appear, higher places counting more; 1 is a perfect order`,
    },
    { metric: `Recall@${k}`, help: `the share of each customer's later items found in the first ${k} (of at most ${k})` },
    { metric: `Precision@${k}`, help: `the share of the first ${k} that the customer went on to use` },
    { metric: 'MAP', help: `mean average precision: precision at each place in the first ${k} where a later item appears, averaged` },
    { metric: 'Coverage', help: `the share of the catalogue that appears in anyone's first ${k}` },
    { metric: 'Customers', help: 'customers with signals in the held-out test window: the figures are averaged over them' },
  ];
}
