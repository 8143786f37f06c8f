import { useEffect, useState } from 'react';
import { describeAutoDials } from '../../src-main/core/curation/choice-cost.ts';
import { describeExclusions } from '../../src-main/core/curation/exclusion-words.ts';
import { AnchorPicker } from '../components/AnchorPicker.tsx';
import { BanPanel } from '../components/BanPanel.tsx';
import { BriefEditor } from '../components/BriefEditor.tsx';
import { CandidatePool } from '../components/CandidatePool.tsx';
import { MeterDetails, ShelfMeterPanel } from '../components/Meter.tsx';
import { PublishedBanner } from '../components/PublishedBanner.tsx';
import { BacktestPanel, SimilarPanel } from '../components/ShelfInsights.tsx';
import { SlotList } from '../components/SlotList.tsx';
import { TargetsForm } from '../components/TargetsForm.tsx';
import { changeMarks, describeChanges } from '../components/change-words.ts';
import { count } from '../components/format.ts';
import { useApp } from '../state/store.ts';


/** One shelf: its slots with editorial actions, its live meter, its rules and its action history. */
export function ShelfEditor() {
  const shelf = useApp((s) => s.curation.edition?.shelves.find((x) => x.label === s.curation.shelf) ?? null);
  const published = useApp((s) => s.curation.edition?.status === 'published');
  const publishedAt = useApp((s) => s.curation.edition?.publishedAt ?? null);
  const whatif = useApp((s) => s.whatif);
  const [slot, setSlot] = useState(1);
  const error = useApp((s) => s.curation.errors.shelf);
  const busy = useApp((s) => s.curation.busy);
  const lastMs = useApp((s) => s.curation.lastActionMs);
  const lastChange = useApp((s) => s.curation.lastChange);
  const act = useApp((s) => s.act);
  const undo = useApp((s) => s.undo);
  const redo = useApp((s) => s.redo);
  const refill = useApp((s) => s.refill);
  const go = useApp((s) => s.go);
  const canUndo = !published && !busy && !!shelf?.canUndo;
  const canRedo = !published && !busy && !!shelf?.canRedo;
  // Ctrl+Z undoes and Ctrl+Shift+Z (or Ctrl+Y) redoes the shelf's last action, as in other editors; inside a
  // text field the keys keep their usual meaning there.
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (!(e.ctrlKey || e.metaKey) || e.altKey) return;
      const t = e.target as HTMLElement | null;
      if (t && (t.tagName === 'INPUT' || t.tagName === 'TEXTAREA' || t.tagName === 'SELECT' || t.isContentEditable)) return;
      const key = e.key.toLowerCase();
      const wantsRedo = (key === 'z' && e.shiftKey) || (key === 'y' && !e.shiftKey);
      const wantsUndo = key === 'z' && !e.shiftKey;
      if (wantsUndo && canUndo) void undo();
      else if (wantsRedo && canRedo) void redo();
      else return;
      e.preventDefault();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [canUndo, canRedo, undo, redo]);
  if (!shelf) return <p className="notice">Choose a shelf on the edition board.</p>;
  const focused = whatif.result?.candidates.find((c) => c.item === whatif.focus) ?? null;
  const preview = focused && whatif.result ? { title: focused.title, slot: whatif.result.slot, delta: focused.delta } : null;
  const readOnly = published || shelf.locked;
  const change = lastChange && lastChange.edition === shelf.edition && lastChange.shelf === shelf.label ? lastChange : null;
  const changeWords = change ? describeChanges(change.changes) : [];
  return (
    <section className="screen" aria-labelledby="shelf-h">
      <header className="screen-head">
        <h1 id="shelf-h">
          {shelf.label} <span className="muted">· {shelf.edition}</span>
        </h1>
        <div className="toolbar" role="toolbar" aria-label="Shelf tools">
          <button type="button" className="quiet" onClick={() => go('board')}>
            Back to edition
          </button>
          <button type="button" className="quiet" disabled={!canUndo} aria-keyshortcuts="Control+Z" onClick={() => void undo()}>
            Undo
          </button>
          <button type="button" className="quiet" disabled={!canRedo} aria-keyshortcuts="Control+Shift+Z" onClick={() => void redo()}>
            Redo
          </button>
          <button type="button" className="quiet" disabled={readOnly || busy} onClick={() => void refill()}>
            Refill
          </button>
          {!published && (
            <button type="button" className="quiet" disabled={busy} onClick={() => void act({ kind: shelf.locked ? 'unlock' : 'lock' })}>
              {shelf.locked ? 'Unlock shelf' : 'Lock shelf'}
            </button>
          )}
        </div>
      </header>
      {published && <PublishedBanner label={shelf.edition} publishedAt={publishedAt} />}
      {!published && shelf.locked && (
        <p className="banner" role="note">
          This shelf is locked: its list stays exactly as it is, and nothing can pin, ban, move or refill it. Unlock the shelf to change it.
        </p>
      )}
      {error && (
        <p className="error" role="alert">
          That action did not go through: {error}
        </p>
      )}
      <p className="muted small" aria-live="polite">
        {shelf.slots.filter((s) => s.item).length} of {shelf.size} slots filled from a pool of {count(shelf.poolSize)}
        {lastMs !== null ? ` · last change shown in ${Math.round(lastMs)} ms` : ''}
      </p>
      <p className="small changes-line" aria-live="polite">
        {change && (changeWords.length > 0 ? changeWords.join(' ') : 'The list did not change.')}
        {change && change.relevanceGivenUp !== null && Number.isFinite(change.relevanceGivenUp) && (
          <span className="muted">
            {' '}
            {change.relevanceGivenUp > 0.0005
              ? `Keeping the list gives up ${change.relevanceGivenUp.toFixed(3)} of predicted relevance against a refill.`
              : 'Keeping the list gives up no predicted relevance against a refill.'}
          </span>
        )}
      </p>
      {describeExclusions(shelf.excluded) && <p className="muted small">Left out of the pool: {describeExclusions(shelf.excluded)}</p>}
      {shelf.violations.length > 0 && (
        <div className="warn" role="status">
          <p>Rules not met:</p>
          <ul>
            {shelf.violations.map((v, i) => (
              <li key={i}>
                {v.title}: {v.reason}
              </li>
            ))}
          </ul>
        </div>
      )}
      <ShelfMeterPanel meter={shelf.meter} brief={shelf.brief} title="Shelf meter" preview={preview} />
      <div className="editor-grid">
        <SlotList slots={shelf.slots} readOnly={readOnly} busy={busy} marks={changeMarks(change?.changes ?? null)} poolSize={shelf.poolSize} onAct={(a) => void act(a)} />
        <div className="side">
          <CandidatePool shelf={shelf} slot={Math.min(slot, shelf.size)} onSlot={setSlot} readOnly={readOnly} onAct={(a) => void act(a)} />
          <MeterDetails meter={shelf.meter} dials={describeAutoDials(shelf.brief.autoDials, shelf.brief.weights)}>
            <TargetsForm brief={shelf.brief} disabled={published} />
          </MeterDetails>
          <BacktestPanel shelf={shelf} />
          <SimilarPanel key={shelf.label} shelf={shelf} />
          <BanPanel shelf={shelf} readOnly={readOnly} />
          <section className="panel" aria-labelledby="history-h">
            <h2 id="history-h">Actions on this shelf</h2>
            {shelf.actions.length === 0 ? (
              <p className="muted">None yet.</p>
            ) : (
              <ol className="history">
                {shelf.actions.map((a) => (
                  <li key={a.seq} className={a.undone ? 'undone' : undefined}>
                    {a.summary}
                    {a.undone ? ' (undone)' : ''}
                    {a.reason ? `: ${a.reason}` : ''}
                  </li>
                ))}
              </ol>
            )}
          </section>
        </div>
      </div>
      <BriefEditor key={JSON.stringify(shelf.brief)} brief={shelf.brief} disabled={readOnly} />
      <AnchorPicker key={`${shelf.edition}/${shelf.label}`} shelf={shelf} readOnly={readOnly} />
    </section>
  );
}
