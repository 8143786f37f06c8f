import { useEffect, useId, useState, type FormEvent } from 'react';
import type { ShelfView } from '../state/curation-slice.ts';
import { useApp } from '../state/store.ts';
import { valuesOf, type Facet } from './BriefLimits.tsx';

/** The scopes an editor chooses from (core/editing/ban-scope.ts), in words. */
const SCOPES = [
  ['shelf', 'This shelf only'],
  ['edition', 'Every shelf of this edition'],
  ['later', 'This edition and later copies'],
  ['until', 'Until a date, copies included'],
  ['always', 'Always (every edition)'],
] as const;
type ScopeChoice = (typeof SCOPES)[number][0];

/**
 * The shelf's bans: items and whole categories, suppliers or tags, each with how far it reaches and a
 * button to lift it; and a form to ban a category, supplier or tag with its scope. A ban "this edition and
 * later" (or until a date) comes along when a later edition is started from this one.
 */
export function BanPanel({ shelf, readOnly }: { shelf: ShelfView; readOnly: boolean }) {
  const act = useApp((s) => s.act);
  const banRule = useApp((s) => s.banRule);
  const busy = useApp((s) => s.curation.busy);
  const names = useApp((s) => s.curation.names);
  const loadNames = useApp((s) => s.loadNames);
  const error = useApp((s) => s.curation.errors.ban);
  const date = useApp((s) => s.curation.edition?.date ?? '');
  const id = useId();
  const [facet, setFacet] = useState<Facet>('category');
  const [value, setValue] = useState('');
  const [scope, setScope] = useState<ScopeChoice>('shelf');
  const [until, setUntil] = useState('');
  useEffect(() => {
    if (!names) void loadNames();
  }, [names, loadNames]);
  const choices = valuesOf(names, facet);
  const ready = value !== '' && (scope !== 'until' || until !== '');
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    if (!ready) return;
    if (await banRule(facet, value, scope === 'until' ? `until:${until}` : scope)) setValue('');
  };
  const none = shelf.bans.length === 0 && shelf.ruleBans.length === 0;
  return (
    <section className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Banned from this shelf</h2>
      {none ? (
        <p className="muted">Nothing is banned here.</p>
      ) : (
        <ul className="bans" aria-label="Bans">
          {shelf.ruleBans.map((b) => (
            <li key={`${b.facet}:${b.value}`}>
              Every {b.facet} {b.value} <span className="muted small">({b.reach})</span>{' '}
              <button
                type="button"
                className="quiet"
                disabled={readOnly || busy}
                onClick={() => void act({ kind: 'unbanRule', facet: b.facet, value: b.value })}
                aria-label={`Lift the ban on the ${b.facet} ${b.value}`}
              >
                Lift the ban
              </button>
            </li>
          ))}
          {shelf.bans.map((b) => (
            <li key={b.item}>
              {b.title} <span className="muted small">({b.reach})</span>{' '}
              <button type="button" className="quiet" disabled={readOnly || busy} onClick={() => void act({ kind: 'unban', item: b.item })} aria-label={`Lift the ban on ${b.title}`}>
                Lift the ban
              </button>
            </li>
          ))}
        </ul>
      )}
      <form className="ban-form" onSubmit={(e) => void submit(e)} aria-label="Ban a category, supplier or tag">
        <fieldset disabled={readOnly}>
          <legend>Ban a category, supplier or tag</legend>
          <div className="row">
            <div className="field">
              <label htmlFor={`${id}-facet`}>Ban by</label>
              <select id={`${id}-facet`} value={facet} onChange={(e) => (setFacet(e.target.value as Facet), setValue(''))}>
                <option value="category">category</option>
                <option value="supplier">supplier</option>
                <option value="tag">tag</option>
              </select>
            </div>
            <div className="field">
              <label htmlFor={`${id}-value`}>Which {facet}</label>
              <select id={`${id}-value`} value={value} onChange={(e) => setValue(e.target.value)}>
                <option value="">Choose…</option>
                {choices.map((v) => (
                  <option key={v} value={v}>
                    {v}
                  </option>
                ))}
              </select>
            </div>
            <div className="field">
              <label htmlFor={`${id}-scope`}>Where the ban holds</label>
              <select id={`${id}-scope`} value={scope} onChange={(e) => setScope(e.target.value as ScopeChoice)}>
                {SCOPES.map(([v, words]) => (
                  <option key={v} value={v}>
                    {words}
                  </option>
                ))}
              </select>
            </div>
            {scope === 'until' && (
              <div className="field">
                <label htmlFor={`${id}-until`}>Until (last edition date)</label>
                <input id={`${id}-until`} type="date" min={date} value={until} onChange={(e) => setUntil(e.target.value)} />
              </div>
            )}
          </div>
          <button type="submit" disabled={readOnly || busy || !ready}>
            Ban this {facet}
          </button>
        </fieldset>
      </form>
      {error && (
        <p className="error" role="alert">
          Could not ban: {error}
        </p>
      )}
    </section>
  );
}
