import { useEffect, useId, useState, type FormEvent } from 'react';
import { today, dateWords } from '../components/format.ts';
import { useApp } from '../state/store.ts';

function NewEditionForm() {
  const editions = useApp((s) => s.curation.editions);
  const error = useApp((s) => s.curation.errors.new);
  const busy = useApp((s) => s.curation.busy);
  const newEdition = useApp((s) => s.newEdition);
  const go = useApp((s) => s.go);
  const [label, setLabel] = useState('');
  const [date, setDate] = useState(today());
  const [from, setFrom] = useState('');
  const id = useId();
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    if (await newEdition(label.trim(), date, from || undefined)) go('board');
  };
  return (
    <form className="panel" onSubmit={(e) => void submit(e)} aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Start an edition</h2>
      <div className="row">
        <div className="field">
          <label htmlFor={`${id}-label`}>Name</label>
          <input id={`${id}-label`} value={label} onChange={(e) => setLabel(e.target.value)} placeholder="Week 49" required />
        </div>
        <div className="field">
          <label htmlFor={`${id}-date`}>Date</label>
          <input id={`${id}-date`} type="date" value={date} onChange={(e) => setDate(e.target.value)} required />
        </div>
        <div className="field">
          <label htmlFor={`${id}-from`}>Copy shelves and briefs from</label>
          <select id={`${id}-from`} value={from} onChange={(e) => setFrom(e.target.value)}>
            <option value="">Nothing (start empty)</option>
            {editions.map((e) => (
              <option key={e.id} value={e.label}>
                {e.label}
              </option>
            ))}
          </select>
        </div>
      </div>
      {error && (
        <p className="error" role="alert">
          Could not start the edition: {error}
        </p>
      )}
      <button type="submit" disabled={busy || label.trim() === ''}>
        Start edition
      </button>
    </form>
  );
}

/** Every edition, drafts and published ones; opening one goes to its board. */
export function Editions() {
  const editions = useApp((s) => s.curation.editions);
  const listError = useApp((s) => s.curation.errors.list);
  const openError = useApp((s) => s.curation.errors.board);
  const load = useApp((s) => s.loadEditions);
  const open = useApp((s) => s.openEdition);
  const go = useApp((s) => s.go);
  useEffect(() => {
    void load();
  }, [load]);
  return (
    <section className="screen" aria-labelledby="editions-h">
      <header className="screen-head">
        <h1 id="editions-h">Editions</h1>
      </header>
      {listError && (
        <p className="error" role="alert">
          Could not list the editions: {listError}
        </p>
      )}
      <div className="panel">
        {editions.length === 0 ? (
          <p className="muted">No editions yet. Start one below.</p>
        ) : (
          <table>
            <caption className="sr-only">Editions</caption>
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">Date</th>
                <th scope="col">Status</th>
                <th scope="col">
                  <span className="sr-only">Open</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {editions.map((e) => (
                <tr key={e.id}>
                  <td>{e.label}</td>
                  <td>{dateWords(e.date)}</td>
                  <td>{e.status === 'published' ? 'Published' : 'Draft'}</td>
                  <td>
                    <button type="button" className="quiet" aria-label={`Open edition ${e.label}`} onClick={async () => (await open(e.label)) && go('board')}>
                      Open
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {openError && (
          <p className="error" role="alert">
            Could not open the edition: {openError}
          </p>
        )}
      </div>
      <NewEditionForm />
    </section>
  );
}
