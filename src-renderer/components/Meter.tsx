import { useEffect, useRef } from 'react';
import { describeChoiceCost } from '../../src-main/core/curation/choice-cost.ts';
import {
  AGE_BINS,
  bandFor,
  bandStatus,
  describeBand,
  describeChange,
  DIRECTION_WORDS,
  EDITION_READINGS,
  formatRange,
  formatReading,
  READINGS,
  readingOf,
  SHELF_READING_KEYS,
  type Band,
  type BandSource,
  type BandStatus,
  type ReadingSpec,
  type ShelfReadingKey,
} from '../../src-main/core/curation/readings.ts';
import type { EditionView, ShelfView } from '../state/curation-slice.ts';
import { num } from './format.ts';

type ShelfMeter = ShelfView['meter'];
type BriefBands = BandSource;

export interface MeterPreview {
  title: string;
  slot: number;
  delta: Record<string, number | null>;
}

const STATUS_WORDS: Record<BandStatus, string> = {
  below: 'below target',
  within: 'on target',
  above: 'above target',
  'no target': 'no target set',
  'no data': 'no data yet',
};

/** Where a value sits on the gauge, 0..100; days beyond the drawn range sit at the end. */
function at(spec: ReadingSpec, v: number): number {
  const { min, max } = spec.range;
  return Math.max(0, Math.min(100, ((v - min) / (max - min)) * 100));
}

/**
 * One reading as a small bar: the track is the reading's whole range, the shaded part its target band,
 * the dark tick the value. The drawing is decoration (aria-hidden): every fact in it is also in words.
 */
function GaugeBar({ spec, value, band, after }: { spec: ReadingSpec; value: number; band: Band; after: number | null }) {
  const lo = band.min === undefined ? 0 : at(spec, band.min);
  const hi = band.max === undefined ? 100 : at(spec, band.max);
  const hasBand = band.min !== undefined || band.max !== undefined;
  return (
    <svg className="gauge-bar" viewBox="0 0 100 10" preserveAspectRatio="none" aria-hidden="true" focusable="false">
      <rect className="gauge-track" x="0" y="2" width="100" height="6" rx="2" />
      {hasBand && <rect className="gauge-band" x={lo} y="2" width={Math.max(0.8, hi - lo)} height="6" />}
      {Number.isFinite(value) && <rect className="gauge-mark" x={Math.min(98.5, at(spec, value))} y="0" width="1.5" height="10" />}
      {after !== null && Number.isFinite(after) && <rect className="gauge-after" x={Math.min(98.5, at(spec, after))} y="0" width="1.5" height="10" />}
    </svg>
  );
}

/** A band in few characters for the strip ("≥ 0.40", "0.45–0.60", "≤ 5%"); the help panel has it in full. */
function shortBand(spec: ReadingSpec, band: Band): string {
  const f = (v: number) => formatReading(spec, v);
  if (band.min !== undefined && band.max !== undefined) return `${f(band.min)}–${f(band.max)}`;
  if (band.min !== undefined) return `≥ ${f(band.min)}`;
  return `≤ ${f(band.max ?? NaN)}`;
}

/**
 * The strip's height as the page's scroll padding (styles.css `--sticky-top`), so a control reached by
 * keyboard is scrolled into view below the strip, never under it (WCAG 2.2, 2.4.11 Focus Not Obscured).
 */
function useStickyTop() {
  const ref = useRef<HTMLElement | null>(null);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const root = document.documentElement;
    const set = () => root.style.setProperty('--sticky-top', `${Math.ceil(el.getBoundingClientRect().height) + 8}px`);
    set();
    const ro = typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(set);
    ro?.observe(el);
    return () => {
      ro?.disconnect();
      root.style.removeProperty('--sticky-top');
    };
  }, []);
  return ref;
}

/** The value as the gauge's headline: shares as %, days as days, scores with their 0–1 range beside them. */
function valueText(spec: ReadingSpec, v: number): string {
  const text = formatReading(spec, v);
  return spec.unit === 'score' && text !== '—' ? `${text} (${formatRange(spec)})` : text;
}

/**
 * The shelf meter: every reading as a gauge against its band, in a strip that stays in view while the
 * editor scrolls (styles.css `.meter-strip`). With a candidate under the pointer or focus, each gauge
 * shows the change in words and whether it moves toward the shelf's target.
 */
export function ShelfMeterPanel({ meter, brief, title = 'Meter', preview }: { meter: ShelfMeter; brief: BriefBands; title?: string; preview?: MeterPreview | null }) {
  const strip = useStickyTop();
  return (
    <section ref={strip} className="panel meter meter-strip" aria-label={title}>
      <div className="meter-head">
        <h2>{title}</h2>
        <p className="small muted preview-line" aria-live="polite">
          {preview ? `If ${preview.title} went into slot ${preview.slot}:` : 'Point at or focus a candidate to see what it would change.'}
        </p>
      </div>
      <ul className="gauges">
        {SHELF_READING_KEYS.map((key) => (
          <Gauge key={key} k={key} meter={meter} brief={brief} preview={preview ?? null} />
        ))}
      </ul>
    </section>
  );
}

function Gauge({ k, meter, brief, preview }: { k: ShelfReadingKey; meter: ShelfMeter; brief: BriefBands; preview: MeterPreview | null }) {
  const spec = READINGS[k];
  const value = readingOf(meter, k);
  const band = bandFor(brief, k);
  const status = bandStatus(value, band);
  const change = preview ? describeChange(k, Number.isFinite(value) ? value : null, preview.delta[k], band) : null;
  const after = preview && change && change.text !== 'no data' && change.text !== 'no change' ? value + (preview.delta[k] ?? 0) : null;
  const bandWords = describeBand(spec, band);
  return (
    <li className={`reading gauge status-${status.replace(' ', '-')}`} aria-describedby={`help-${k}`}>
      <span className="gauge-name">{spec.name}</span>
      <span className="gauge-value">{valueText(spec, value)}</span>
      <GaugeBar spec={spec} value={value} band={band} after={after} />
      {/* Always one line: showing a what-if never moves the layout under the pointer. */}
      {change ? (
        <span className={`delta dir-${change.direction.replace(' ', '-')}`}>
          {change.text}
          {change.direction === 'closer' || change.direction === 'further' || change.direction === 'stays within' ? `, ${DIRECTION_WORDS[change.direction]}` : ''}
        </span>
      ) : (
        <span className="gauge-band-words">
          {STATUS_WORDS[status]}
          {bandWords !== 'no target' && (
            <>
              , <span aria-hidden="true">{shortBand(spec, band)}</span>
              <span className="sr-only">{bandWords}</span>
            </>
          )}
        </span>
      )}
    </li>
  );
}

/** The band a shelf has until its brief sets one, in words for the help list. */
function defaultWords(spec: ReadingSpec): string {
  if (spec.key === 'promotedShareCount' || spec.key === 'promotedShareExposure') return '';
  const d = describeBand(spec, spec.defaultBand);
  return d === 'no target' ? ' No target unless you set one.' : ` Default ${d}.`;
}

const MIX_ROWS = 6;

/** The shelf's category mix beside its audience's: one pair of bars per category, the weightiest on either side first. */
function CategoryMix({ mix }: { mix: ShelfMeter['categoryMix'] }) {
  const shown = mix.slice(0, MIX_ROWS);
  const rest = mix.slice(MIX_ROWS);
  const restShelf = rest.reduce((s, r) => s + r.shelf, 0);
  const restAudience = rest.reduce((s, r) => s + r.audience, 0);
  const pc = (v: number) => `${Math.round(v * 100)}%`;
  return (
    <figure className="mix" aria-labelledby="mix-h">
      <figcaption id="mix-h" className="mini-h">
        Category mix: shelf <span className="key key-shelf" aria-hidden="true" /> against audience <span className="key key-audience" aria-hidden="true" />
      </figcaption>
      {mix.length === 0 ? (
        <p className="muted small">No categories to compare yet.</p>
      ) : (
        <ul className="mix-rows">
          {shown.map((r) => (
            <li key={r.category}>
              <span className="mix-name">{r.category}</span>
              <span className="mix-bars" aria-hidden="true">
                <span className="mix-bar mix-shelf" style={{ width: `${r.shelf * 100}%` }} />
                <span className="mix-bar mix-audience" style={{ width: `${r.audience * 100}%` }} />
              </span>
              <span className="mix-num">
                {pc(r.shelf)} <span className="muted">/ {pc(r.audience)}</span>
                <span className="sr-only">: {pc(r.shelf)} of the shelf, {pc(r.audience)} of the audience</span>
              </span>
            </li>
          ))}
          {rest.length > 0 && (
            <li className="muted">
              <span className="mix-name">
                {rest.length} other{rest.length === 1 ? '' : 's'}
                <span className="sr-only"> {rest.length === 1 ? 'category' : 'categories'}</span>
              </span>
              <span className="mix-bars" aria-hidden="true">
                <span className="mix-bar mix-shelf" style={{ width: `${restShelf * 100}%` }} />
                <span className="mix-bar mix-audience" style={{ width: `${restAudience * 100}%` }} />
              </span>
              <span className="mix-num">
                {pc(restShelf)} / {pc(restAudience)}
                <span className="sr-only">: {pc(restShelf)} of the shelf, {pc(restAudience)} of the audience</span>
              </span>
            </li>
          )}
        </ul>
      )}
    </figure>
  );
}

/** How old the shelf's items are, as a histogram over readings.ts AGE_BINS; each bar carries its count. */
function AgeHistogram({ counts }: { counts: number[] }) {
  const top = Math.max(1, ...counts);
  return (
    <figure className="ages" aria-labelledby="ages-h">
      <figcaption id="ages-h" className="mini-h">
        Item age at the edition date
      </figcaption>
      <ol className="age-bins">
        {AGE_BINS.map(({ label }, b) => (
          <li key={label}>
            <span className="age-count">{counts[b] ?? 0}</span>
            <span className="age-col" aria-hidden="true">
              <span className="age-fill" style={{ height: `${((counts[b] ?? 0) / top) * 100}%` }} />
            </span>
            <span className="age-label">
              {label}
              <span className="sr-only">: {counts[b] ?? 0} {(counts[b] ?? 0) === 1 ? 'item' : 'items'}</span>
            </span>
          </li>
        ))}
      </ol>
    </figure>
  );
}


/**
 * What the meter's gauges summarise, drawn where people would rather look than read (category mix, item
 * ages), what each reading means (visible without a mouse), the saturation warning and the targets form.
 */
/** `dials`: the line saying the dials were set for the brief (core/curation/choice-cost.ts describeAutoDials), if they were. */
export function MeterDetails({ meter, dials, children }: { meter: ShelfMeter; dials?: string | null; children?: React.ReactNode }) {
  const sat = meter.saturatedSlots;
  return (
    <section className="panel meter-details" aria-labelledby="meter-details-h">
      <h2 id="meter-details-h">Meter in detail</h2>
      {sat.length > 0 && (
        <p className="warn">
          {sat.length === 1 ? 'Slot' : 'Slots'} {sat.join(', ')}: most of this audience already {sat.length === 1 ? 'has this item' : 'has these items'}.
        </p>
      )}
      <CategoryMix mix={meter.categoryMix} />
      <AgeHistogram counts={meter.ageHistogram} />
      <p className="small" data-testid="choice-cost">
        {describeChoiceCost(meter.choiceCost ?? NaN)}
      </p>
      {dials && (
        <p className="small muted" data-testid="auto-dials">
          {dials}
        </p>
      )}
      {meter.noveltyBits !== null && (
        <p className="small muted">
          Novelty {formatReading(READINGS.novelty, meter.novelty)}: a typical item here is known to about 1 customer in{' '}
          {Math.max(1, Math.round(2 ** meter.noveltyBits)).toLocaleString('en')}.
        </p>
      )}
      {children}
      <h3 className="mini-h">What the readings mean</h3>
      <dl className="reading-help">
        {SHELF_READING_KEYS.map((k) => (
          <div key={k}>
            <dt>{READINGS[k].name}</dt>
            <dd id={`help-${k}`}>
              {READINGS[k].help}{' '}
              <span className="muted">
                Range {formatRange(READINGS[k])}.{defaultWords(READINGS[k])}
              </span>
            </dd>
          </div>
        ))}
      </dl>
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
          <dt>{EDITION_READINGS.distinctItems.name}</dt>
          <dd>{meter.distinctItems}</dd>
          <dd className="small muted reading-note">{EDITION_READINGS.distinctItems.help}</dd>
        </div>
        <div className="reading">
          <dt>{EDITION_READINGS.supplierExposureGini.name}</dt>
          <dd>{num(meter.supplierExposureGini)} (0–1)</dd>
          <dd className="small muted reading-note">{EDITION_READINGS.supplierExposureGini.help}</dd>
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
