import { useVirtualizer } from '@tanstack/react-virtual';
import { useEffect, useId, useRef } from 'react';
import type { ShelfAction, ShelfView } from '../state/curation-slice.ts';
import { useApp } from '../state/store.ts';
import { reasonWords } from '../../src-main/core/curation/reason-words.ts';
import { count, rankWords, screenNumbers } from './format.ts';
import { ItemPicture } from './ItemPicture.tsx';
import { SlotSelect } from './SlotSelect.tsx';

/** Four lines: the title (up to two, so it is read whole in the narrow side column), rank, reason. */
const ROW_PX = 88;

/**
 * The best candidates not on the shelf for one slot, from `shelf.whatif`, virtualised
 * (@tanstack/react-virtual) so hundreds of rows cost a screenful of DOM. Pointing at a row or focusing it
 * by keyboard shows, on the meter, what placing it in the slot would change; Pin places it.
 */
export function CandidatePool({ shelf, slot, onSlot, readOnly, onAct }: { shelf: ShelfView; slot: number; onSlot(n: number): void; readOnly: boolean; onAct(a: ShelfAction): void }) {
  const whatif = useApp((s) => s.whatif);
  const load = useApp((s) => s.loadWhatIf);
  const focus = useApp((s) => s.focusCandidate);
  const id = useId();
  const key = `${shelf.edition}/${shelf.label}/${slot}`;
  // Every action changes the shelf, and so the deltas: reload on each (the action count tracks them).
  const version = `${shelf.actions.length}:${shelf.actions.filter((a) => a.undone).length}:${JSON.stringify(shelf.brief)}`;
  useEffect(() => {
    void load(slot);
    focus(null);
  }, [key, version, slot, load, focus]);
  const items = whatif.key === key && whatif.result ? whatif.result.candidates : [];
  const scroller = useRef<HTMLDivElement>(null);
  const virtual = useVirtualizer({ count: items.length, getScrollElement: () => scroller.current, estimateSize: () => ROW_PX, overscan: 6 });

  return (
    <section className="panel pool" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Candidates</h2>
      <SlotSelect id={`${id}-slot`} label="For slot" shelf={shelf} value={slot} onChange={onSlot} />
      {whatif.error && (
        <p className="error" role="alert">
          Could not rank the candidates: {whatif.error}
        </p>
      )}
      <p className="muted small">{whatif.loading && items.length === 0 ? 'Ranking…' : `${count(items.length)} candidates not on this shelf, best first`}</p>
      {/* Read-only, the Pin buttons are disabled and cannot take focus, so the list itself does: a scrolling
          region must be reachable by keyboard (WCAG 2.1.1; axe "scrollable-region-focusable"). */}
      <div
        ref={scroller}
        className="pool-scroll"
        onMouseLeave={() => focus(null)}
        {...(readOnly ? { tabIndex: 0, role: 'region', 'aria-labelledby': `${id}-h` } : {})}
      >
        <ul style={{ height: virtual.getTotalSize(), position: 'relative' }} aria-label="Candidates for this slot">
          {virtual.getVirtualItems().map((v) => {
            const c = items[v.index];
            if (!c) return null;
            return (
              <li
                key={c.item}
                className={`candidate${whatif.focus === c.item ? ' focused' : ''}`}
                style={{ position: 'absolute', top: 0, left: 0, right: 0, height: ROW_PX, transform: `translateY(${v.start}px)` }}
                onMouseEnter={() => focus(c.item)}
              >
                <ItemPicture item={c.item} size="pool" />
                <div className="candidate-main">
                  <p className="slot-title" title={c.title}>
                    {c.title}
                  </p>
                  <p className="small">
                    {c.promoted && <span className="sponsored">Sponsored</span>} <span className="muted">{rankWords(c.rank, shelf.poolSize)}</span>
                  </p>
                  {c.reason && (
                    <p className="small reason" title={reasonWords(c.reason, screenNumbers)}>
                      {reasonWords(c.reason, screenNumbers)}
                    </p>
                  )}
                </div>
                <button
                  type="button"
                  className="quiet"
                  disabled={readOnly}
                  aria-label={`Pin ${c.title} into slot ${slot}`}
                  onFocus={() => focus(c.item)}
                  onBlur={() => focus(null)}
                  onClick={() => onAct({ kind: 'pin', slot, item: c.item })}
                >
                  Pin
                </button>
              </li>
            );
          })}
        </ul>
      </div>
    </section>
  );
}
