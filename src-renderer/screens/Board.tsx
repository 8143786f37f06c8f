import { useId, useState, type FormEvent } from 'react';
import { formatReading, READINGS } from '../../src-main/core/curation/readings.ts';
import { EditionMeterPanel } from '../components/Meter.tsx';
import { count, dateWords, pct } from '../components/format.ts';
import { ItemPicture } from '../components/ItemPicture.tsx';
import { PublishConfirm } from '../components/PublishConfirm.tsx';
import { PublishedBanner } from '../components/PublishedBanner.tsx';
import { ExportPanel } from './ExportPanel.tsx';
import { useApp } from '../state/store.ts';

function AddShelfForm() {
  const addShelf = useApp((s) => s.addShelf);
  const error = useApp((s) => s.curation.errors.addShelf);
  const busy = useApp((s) => s.curation.busy);
  const [label, setLabel] = useState('');
  const [size, setSize] = useState(8);
  const id = useId();
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    if (await addShelf(label.trim(), { size })) setLabel('');
  };
  return (
    <form className="panel" onSubmit={(e) => void submit(e)} aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Add a shelf</h2>
      <div className="row">
        <div className="field">
          <label htmlFor={`${id}-l`}>Shelf name</label>
          <input id={`${id}-l`} value={label} onChange={(e) => setLabel(e.target.value)} placeholder="Homepage row" required />
        </div>
        <div className="field">
          <label htmlFor={`${id}-s`}>Slots</label>
          <input id={`${id}-s`} type="number" min={1} max={200} value={size} onChange={(e) => setSize(Number(e.target.value))} required />
        </div>
      </div>
      {error && (
        <p className="error" role="alert">
          Could not add the shelf: {error}
        </p>
      )}
      <button type="submit" disabled={busy || label.trim() === ''}>
        Add shelf
      </button>
    </form>
  );
}

/** One edition: its shelves as cards with their key readings, the edition meter, publish and export. */
export function Board() {
  const edition = useApp((s) => s.curation.edition);
  const publishError = useApp((s) => s.curation.errors.publish);
  const busy = useApp((s) => s.curation.busy);
  const publish = useApp((s) => s.publish);
  const openShelf = useApp((s) => s.openShelf);
  const go = useApp((s) => s.go);
  const opened = useApp((s) => s.curation.opened);
  const [confirming, setConfirming] = useState(false);
  if (!edition) return <p className="notice">Open or start an edition on the Editions screen.</p>;
  const published = edition.status === 'published';
  return (
    <section className="screen" aria-labelledby="board-h">
      <header className="screen-head">
        <h1 id="board-h">
          {edition.label} <span className="muted">· {dateWords(edition.date)} · {published ? 'Published' : 'Draft'}</span>
        </h1>
        {!published && (
          <button type="button" disabled={busy || confirming || edition.shelves.length === 0} onClick={() => setConfirming(true)}>
            Publish edition
          </button>
        )}
      </header>
      {published && <PublishedBanner label={edition.label} publishedAt={edition.publishedAt} />}
      {!published && confirming && (
        <PublishConfirm
          edition={edition}
          opened={opened}
          busy={busy}
          onCancel={() => setConfirming(false)}
          onPublish={() => void publish().then(() => setConfirming(false))}
        />
      )}
      {publishError && (
        <p className="error" role="alert">
          Could not publish: {publishError}
        </p>
      )}
      <div className="shelf-cards">
        {edition.shelves.length === 0 && <p className="muted">No shelves yet. Add one below.</p>}
        {edition.shelves.map((s) => {
          const sponsored = s.slots.filter((x) => x.promoted).length;
          return (
            <article key={s.label} className="panel shelf-card" aria-label={`Shelf ${s.label}`}>
              <h2>{s.label}</h2>
              <p className="muted">
                {s.slots.filter((x) => x.item).length} of {s.size} slots filled · pool of {count(s.poolSize)}
                {s.locked ? ' · locked: its list stays as it is until unlocked' : ''}
              </p>
              <p>
                {READINGS.intraListDistance.name} {formatReading(READINGS.intraListDistance, s.meter.intraListDistance)} (0–1) · Sponsored {sponsored} (
                {pct(s.meter.promotedShareCount)})
              </p>
              {s.violations.length > 0 && <p className="warn">{s.violations.length} rule{s.violations.length === 1 ? '' : 's'} not met</p>}
              <ol className="mini-slots">
                {s.slots.slice(0, 5).map((x) => (
                  <li key={x.slot}>
                    <ItemPicture item={x.item} size="mini" /> {x.title ?? 'empty'} {x.promoted && <span className="sponsored">Sponsored</span>}
                  </li>
                ))}
              </ol>
              {/* The card lists the first five slots; the rest are counted, so a card never looks complete when it is not. */}
              {s.slots.length > 5 && <p className="muted small">+{count(s.slots.length - 5)} more</p>}
              <button
                type="button"
                aria-label={`Edit shelf ${s.label}`}
                onClick={() => {
                  openShelf(s.label);
                  go('shelf');
                }}
              >
                {published ? 'View' : 'Edit'}
              </button>
            </article>
          );
        })}
      </div>
      <EditionMeterPanel meter={edition.meter} shelves={edition.shelves} />
      {!published && <AddShelfForm />}
      <ExportPanel />
    </section>
  );
}
