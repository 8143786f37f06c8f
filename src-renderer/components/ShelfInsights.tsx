import { useId, useState } from 'react';
import type { ShelfView } from '../state/curation-slice.ts';
import { useApp } from '../state/store.ts';
import { num, pct, dateWords, count } from './format.ts';
import { Notes } from './Notes.tsx';

/**
 * Backtest (`shelf.backtest`): the share of the shelf's audience that engaged with its items in the most
 * recent window held out of the data, beside a popularity-only list of the same size. A share is only a
 * replay of the past, so the window is always shown with it.
 */
export function BacktestPanel({ shelf }: { shelf: ShelfView }) {
  const result = useApp((s) => (s.insight.backtestFor === `${shelf.edition}/${shelf.label}` ? s.insight.backtest : null));
  const busy = useApp((s) => s.insight.busy.backtest ?? false);
  const error = useApp((s) => s.insight.errors.backtest);
  const run = useApp((s) => s.runBacktest);
  const [days, setDays] = useState(28);
  const id = useId();
  const bar = (label: string, share: number | null, engaged: number) => (
    <>
      <span>{label}</span>
      <span className="bar-track" aria-hidden="true">
        <span className="bar-fill" style={{ width: `${Math.min(100, (share ?? 0) * 100)}%` }} />
      </span>
      <span className="bar-value" aria-label={`${label}: ${pct(share, 1)}, ${engaged} customers`}>
        {pct(share, 1)}
      </span>
    </>
  );
  return (
    <section className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Backtest</h2>
      <p className="small" id={`${id}-what`}>
        What it measures: of this shelf’s audience who were active in the last {count(days)} days of the data, the share who interacted
        with at least one of the shelf’s items in those days, beside the same share for a list of the same size of the items most
        customers chose in the {count(days)} days before. It replays the past; it does not predict how the shelf will do.
      </p>
      <div className="field">
        <label htmlFor={`${id}-d`}>Window (last days of the data)</label>
        <input id={`${id}-d`} type="number" min={1} max={365} value={days} aria-describedby={`${id}-what`} onChange={(e) => setDays(Number(e.target.value))} />
      </div>
      <button type="button" className="quiet" disabled={busy} onClick={() => void run(days)}>
        {busy ? 'Replaying…' : 'Run backtest'}
      </button>
      {error && (
        <p className="error" role="alert">
          Could not backtest: {error} Try a shorter window, or import signals with dates.
        </p>
      )}
      {result && (
        <div aria-live="polite" aria-label="Backtest result">
          <p className="small">
            {dateWords(result.windowStart)} to {dateWords(result.windowEnd)} ({result.windowDays} days) · {count(result.audienceActive)} audience
            customers active
          </p>
          <div className="compare-bars">
            {bar('This shelf', result.shelf.share, result.shelf.engaged)}
            {bar('Popularity only', result.popularity.share, result.popularity.engaged)}
          </div>
          <Notes notes={result.notes} />
        </div>
      )}
    </section>
  );
}

/**
 * The items most like one slot's item (`item.similar`), each saying whether it is alike in content
 * (title, description, tags) or in who bought it (collaborative), and which of the two counts more.
 */
export function SimilarPanel({ shelf }: { shelf: ShelfView }) {
  const result = useApp((s) => s.insight.similar);
  const busy = useApp((s) => s.insight.busy.similar ?? false);
  const error = useApp((s) => s.insight.errors.similar);
  const load = useApp((s) => s.loadSimilar);
  const filled = shelf.slots.filter((s) => s.item);
  const [slot, setSlot] = useState(filled[0]?.slot ?? 1);
  const id = useId();
  const item = shelf.slots.find((s) => s.slot === slot)?.item ?? null;
  return (
    <section className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Similar items</h2>
      <div className="field">
        <label htmlFor={`${id}-s`}>Like the item in slot</label>
        <select id={`${id}-s`} value={slot} onChange={(e) => setSlot(Number(e.target.value))}>
          {filled.map((s) => (
            <option key={s.slot} value={s.slot}>
              {s.slot}: {s.title}
            </option>
          ))}
        </select>
      </div>
      <button type="button" className="quiet" disabled={busy || !item} onClick={() => item && void load(item)}>
        Show similar items
      </button>
      {error && (
        <p className="error" role="alert">
          Could not find similar items: {error} Train the models on the Models screen, then try again.
        </p>
      )}
      {result && (
        <div aria-live="polite">
          <p className="small">Most like {result.item.title}:</p>
          <ul className="history" aria-label={`Items like ${result.item.title}`}>
            {result.neighbours.map((n) => (
              <li key={n.item}>
                {n.title} {n.promoted && <span className="sponsored">Sponsored</span>}
                <br />
                <span className="small muted">
                  {n.mainReason === 'content' ? 'Mostly alike in content' : 'Mostly bought by the same customers'} · content {num(n.content)} ·
                  collaborative {num(n.collaborative)}
                  {n.coldStart ? ' · new: only content can vouch for it' : ''}
                </span>
              </li>
            ))}
          </ul>
          {result.notes.map((n, i) => (
            <p key={i} className="small muted">
              {n}
            </p>
          ))}
        </div>
      )}
    </section>
  );
}
