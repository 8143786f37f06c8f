import type { EditionView, ShelfView } from '../state/curation-slice.ts';
import { describeChoiceCost } from '../../src-main/core/curation/choice-cost.ts';
import { days, num, pct } from './format.ts';

type ShelfMeter = ShelfView['meter'];

interface Reading {
  /** The reading's name in a what-if (core/curation/types.ts WHAT_IF_READINGS). */
  key: string;
  label: string;
  value: string;
  hint: string;
  /** How a change is written: percentage points, days or a plain number. */
  unit: 'pp' | 'd' | 'n';
}

/** The shelf readings of DESIGN.md, "Meter readings", each with a one-line meaning for editors. */
export function shelfReadings(m: ShelfMeter): Reading[] {
  return [
    { key: 'intraListDistance', unit: 'n', label: 'Variety', value: num(m.intraListDistance), hint: 'mean pairwise distance between items (0 = all alike, 1 = all different)' },
    { key: 'ageMedianDays', unit: 'd', label: 'Median age', value: days(m.age.medianDays), hint: 'median days since items were added, at the edition date' },
    { key: 'ageShareUnder30Days', unit: 'pp', label: 'Under 30 days', value: pct(m.age.shareUnder30Days), hint: 'share of items added in the last 30 days' },
    { key: 'novelty', unit: 'n', label: 'Novelty', value: num(m.novelty, 1), hint: 'mean self-information in bits: higher means less familiar items' },
    { key: 'promotedShareCount', unit: 'pp', label: 'Sponsored slots', value: pct(m.promotedShareCount), hint: 'share of slots taken by promoted items' },
    { key: 'promotedShareExposure', unit: 'pp', label: 'Sponsored exposure', value: pct(m.promotedShareExposure), hint: 'share of position-weighted attention on promoted items' },
    { key: 'calibrationGap', unit: 'n', label: 'Calibration gap', value: num(m.calibrationGap, 3), hint: "distance from the audience's category mix (0 = matches)" },
    { key: 'predictedRelevance', unit: 'n', label: 'Predicted relevance', value: num(m.predictedRelevance), hint: "mean validated relevance of the shelf's items for its audience (0..1)" },
    { key: 'choiceCost', unit: 'pp', label: 'Price of choices', value: pct(m.choiceCost), hint: 'relevance the dials and rules give up against the most relevant list for this audience' },
  ];
}

/** A what-if change in the reading's own unit, signed; null or 0 shows as "no change". */
export function formatDelta(d: number | null | undefined, unit: Reading['unit']): string {
  if (d === null || d === undefined || !Number.isFinite(d)) return 'no data';
  const text = unit === 'pp' ? `${(d * 100).toFixed(0)} pts` : unit === 'd' ? `${Math.round(d)} d` : d.toFixed(2);
  if (/^-?0(\.0+)?( pts| d)?$/.test(text)) return 'no change';
  return d > 0 ? `+${text}` : text.replace('-', '−');
}

export interface MeterPreview {
  title: string;
  slot: number;
  delta: Record<string, number | null>;
}

/** `dials`: the line saying the dials were set for the brief (core/curation/choice-cost.ts describeAutoDials), if they were. */
export function ShelfMeterPanel({ meter, title = 'Meter', preview, dials }: { meter: ShelfMeter; title?: string; preview?: MeterPreview | null; dials?: string | null }) {
  return (
    <section className="panel meter" aria-label={title}>
      <h2>{title}</h2>
      <p className="small muted preview-line" aria-live="polite">
        {preview ? `If ${preview.title} went into slot ${preview.slot}:` : 'Point at or focus a candidate to see what it would change.'}
      </p>
      <dl className="readings">
        {shelfReadings(meter).map((r) => (
          <div key={r.label} className="reading" title={r.hint}>
            <dt>{r.label}</dt>
            <dd>
              {r.value}
              {/* Always present, so showing a what-if never moves the layout under the pointer. */}
              <span className="delta"> {preview ? formatDelta(preview.delta[r.key], r.unit) : '\u00a0'}</span>
            </dd>
          </div>
        ))}
      </dl>
      <p className="small" data-testid="choice-cost">
        {describeChoiceCost(meter.choiceCost ?? NaN)}
      </p>
      {dials && (
        <p className="small muted" data-testid="auto-dials">
          {dials}
        </p>
      )}
      {meter.saturatedSlots.length > 0 && (
        <p className="warn">
          Slots {meter.saturatedSlots.join(', ')}: most of this audience already has these items.
        </p>
      )}
    </section>
  );
}

export function EditionMeterPanel({ meter, shelves }: { meter: EditionView['meter']; shelves: readonly ShelfView[] }) {
  const name = (i: number) => shelves[i]?.label ?? `shelf ${i + 1}`;
  return (
    <section className="panel meter" aria-label="Edition meter">
      <h2>Edition meter</h2>
      <dl className="readings">
        <div className="reading">
          <dt>Distinct items</dt>
          <dd>{meter.distinctItems}</dd>
        </div>
        <div className="reading" title="inequality of exposure across suppliers: 0 = even, 1 = one supplier takes all">
          <dt>Supplier exposure Gini</dt>
          <dd>{num(meter.supplierExposureGini)}</dd>
        </div>
      </dl>
      {meter.overlaps.filter((o) => o.shared > 0).length > 0 ? (
        <ul className="overlaps">
          {meter.overlaps
            .filter((o) => o.shared > 0)
            .map((o) => (
              <li key={`${o.a}-${o.b}`}>
                {name(o.a)} and {name(o.b)} share {o.shared} item{o.shared === 1 ? '' : 's'}
              </li>
            ))}
        </ul>
      ) : (
        <p className="muted">No item appears on two shelves.</p>
      )}
    </section>
  );
}
