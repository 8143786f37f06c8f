import type { ResponseOf } from '../../../api/contract.ts';
import { bandFor, describeChange, DIRECTION_WORDS, READINGS, type BandSource, type ShelfReadingKey } from '../../../core/curation/readings.ts';
import { formatNumber, table } from '../format.ts';

/** The readings `shelf whatif` prints a column for, by the names of core/curation/readings.ts. */
const COLUMNS: ShelfReadingKey[] = ['intraListDistance', 'novelty', 'calibrationGap', 'promotedShareCount', 'predictedRelevance'];

/** Each candidate's change per reading, with whether it moves the reading toward the shelf's target, in words. */
export function renderWhatIf(r: ResponseOf<'shelf.whatif'>, brief: BandSource): string {
  const cell = (key: ShelfReadingKey, delta: number | null | undefined) => {
    const c = describeChange(key, r.before[key] ?? null, delta, bandFor(brief, key));
    const words = c.direction === 'closer' || c.direction === 'further' ? `, ${DIRECTION_WORDS[c.direction]}` : '';
    return `${c.text}${words}`;
  };
  return table(
    ['item', 'title', 'sponsored', 'rank', ...COLUMNS.map((k) => `Δ ${READINGS[k].name}`)],
    r.candidates.map((c) => [c.item, c.title, c.promoted ? 'Sponsored' : '', formatNumber(c.rank), ...COLUMNS.map((k) => cell(k, c.delta[k]))]),
  );
}
