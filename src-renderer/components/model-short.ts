/**
 * A model's short name for a chart's axis: the method's own name (published methods keep their names), or the
 * plain word for a baseline. The table beside a chart names each model in full (core/models/model-words.ts);
 * under a bar group the full names ran into one another, even at 1280 px.
 */
const SHORT: Readonly<Record<string, string>> = {
  content: 'Content',
  itemknn: 'item-kNN',
  ials: 'iALS',
  ease: 'EASE',
  hybrid: 'Hybrid',
  popularity: 'Popularity',
  random: 'Random',
};

/** An unknown model keeps its id, as the table shows it. */
export function modelShortWords(model: string): string {
  return SHORT[model] ?? model;
}
