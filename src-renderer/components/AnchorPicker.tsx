import { useId, useState, type FormEvent } from 'react';
import type { ShelfView } from '../state/curation-slice.ts';
import type { ItemRef } from '../state/insight-slice.ts';
import { useApp } from '../state/store.ts';
import { rankWords, screenNumbers } from './format.ts';
import { reasonWords } from '../../src-main/core/curation/reason-words.ts';
import { SlotSelect } from './SlotSelect.tsx';

/**
 * Anchors: items the shelf should be "like". The editor searches the catalogue (`item.search`), adds or
 * removes anchors, and sees the pool ranked towards them (`propose`, which names anchors by external id)
 * for this shelf's audience; any proposal can be pinned into a slot from here.
 */
export function AnchorPicker({ shelf, readOnly }: { shelf: ShelfView; readOnly: boolean }) {
  const search = useApp((s) => s.searchItems);
  const found = useApp((s) => s.insight.search);
  const searching = useApp((s) => s.insight.busy.search ?? false);
  const searchError = useApp((s) => s.insight.errors.search);
  const proposeWith = useApp((s) => s.proposeWith);
  const proposal = useApp((s) => s.insight.proposal);
  const proposing = useApp((s) => s.insight.busy.propose ?? false);
  const proposeError = useApp((s) => s.insight.errors.propose);
  const date = useApp((s) => s.curation.edition?.date);
  // "Fill from these anchors" is one undoable action: the anchors change and the list starts over.
  const act = useApp((s) => s.act);
  const [query, setQuery] = useState('');
  const [searched, setSearched] = useState(false);
  // Anchors already in the brief come back as item ids; their titles show once searched or ranked.
  const [anchors, setAnchors] = useState<ItemRef[]>(() =>
    shelf.brief.anchors.map((item) => ({ item, title: item, category: '', promoted: false })),
  );
  const saved = shelf.brief.anchors.join('\n');
  const [slot, setSlot] = useState(1);
  // The store keeps the last ranking; it is shown only while the anchors are the ones it was made for.
  const [rankedFor, setRankedFor] = useState<string | null>(null);
  const anchorKey = anchors.map((a) => a.item).join('\n');
  const id = useId();
  const find = async (e: FormEvent) => {
    e.preventDefault();
    if (query.trim() === '') return;
    await search(query.trim());
    setSearched(true);
  };
  const has = (item: string) => anchors.some((a) => a.item === item);
  return (
    <section className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Anchors: rank towards items like these</h2>
      <form onSubmit={(e) => void find(e)} className="row">
        <div className="field">
          <label htmlFor={`${id}-q`}>Find items by title or id</label>
          <input id={`${id}-q`} type="search" value={query} onChange={(e) => setQuery(e.target.value)} />
        </div>
        <button type="submit" className="quiet" disabled={searching || query.trim() === ''}>
          Search
        </button>
      </form>
      {searchError && (
        <p className="error" role="alert">
          Could not search: {searchError}
        </p>
      )}
      {searched && found.length === 0 && !searchError && <p className="muted small">No item matches “{query}”. Try part of a title.</p>}
      {found.length > 0 && (
        <ul className="results" aria-label="Search results">
          {found.map((it) => (
            <li key={it.item}>
              <span>
                {it.title} <span className="muted small">({it.item})</span> {it.promoted && <span className="sponsored">Sponsored</span>}
              </span>
              <button type="button" className="quiet" disabled={has(it.item)} onClick={() => setAnchors([...anchors, it])} aria-label={`Add ${it.title} as an anchor`}>
                {has(it.item) ? 'Added' : 'Add'}
              </button>
            </li>
          ))}
        </ul>
      )}
      {anchors.length === 0 ? (
        <p className="muted small">No anchors chosen.</p>
      ) : (
        <ul className="anchor-list" aria-label="Chosen anchors">
          {anchors.map((a) => (
            <li key={a.item}>
              {a.title}
              <button type="button" className="quiet" aria-label={`Remove anchor ${a.title}`} onClick={() => setAnchors(anchors.filter((x) => x.item !== a.item))}>
                Remove
              </button>
            </li>
          ))}
        </ul>
      )}
      <button
        type="button"
        disabled={proposing || anchors.length === 0}
        onClick={() => {
          setRankedFor(anchorKey);
          void proposeWith({ anchors: anchors.map((a) => a.item), audience: shelf.brief.audience, n: 8, ...(date ? { date } : {}) });
        }}
      >
        Rank the pool towards these anchors
      </button>{' '}
      <button
        type="button"
        className="quiet"
        disabled={readOnly || anchorKey === saved}
        onClick={() => void act({ kind: 'anchors', anchors: anchors.map((a) => a.item) })}
      >
        {anchors.length === 0 ? 'Clear the shelf’s anchors' : 'Fill the shelf from these anchors'}
      </button>
      {proposeError && (
        <p className="error" role="alert">
          Could not rank the pool: {proposeError}
        </p>
      )}
      {proposal && rankedFor === anchorKey && (
        <div aria-live="polite">
          <SlotSelect id={`${id}-slot`} label="Pin a proposal into slot" shelf={shelf} value={slot} onChange={setSlot} />
          <ol className="results" aria-label="Proposals ranked towards the anchors">
            {proposal.items.map((p) => (
              <li key={p.item}>
                <span>
                  {p.title} {p.sponsored && <span className="sponsored">Sponsored</span>}{' '}
                  <span className="muted small">
                    {rankWords(p.rank, proposal.poolSize)}
                    {p.coldStart ? ' · new item' : ''}
                  </span>
                  {p.reason && <span className="small reason-line">{reasonWords(p.reason, screenNumbers)}</span>}
                </span>
                <button type="button" className="quiet" disabled={readOnly} aria-label={`Pin ${p.title} into slot ${slot}`} onClick={() => void act({ kind: 'pin', slot, item: p.item })}>
                  Pin
                </button>
              </li>
            ))}
          </ol>
        </div>
      )}
    </section>
  );
}
