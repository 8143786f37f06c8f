import { useEffect, useId, useState, type FormEvent } from 'react';
import { useApp } from '../state/store.ts';
import { dateWords, momentWords } from '../components/format.ts';

/** Published editions and what changed between two of them, shelf by shelf. */
export function History() {
  const editions = useApp((s) => s.curation.editions);
  const comparison = useApp((s) => s.curation.comparison);
  /** Titles as published, with the shop's id for the editor's search. */
  const named = (id: string) => (comparison?.titles[id] ? `${comparison.titles[id]} (${id})` : id);
  const error = useApp((s) => s.curation.errors.compare);
  const load = useApp((s) => s.loadEditions);
  const compare = useApp((s) => s.compare);
  const id = useId();
  const [a, setA] = useState('');
  const [b, setB] = useState('');
  useEffect(() => {
    void load();
  }, [load]);
  const published = editions.filter((e) => e.status === 'published');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    void compare(a, b);
  };
  return (
    <section className="screen" aria-labelledby="history-screen-h">
      <h1 id="history-screen-h">History</h1>
      <div className="panel">
        <h2>Published editions</h2>
        {published.length === 0 ? (
          <p className="muted">Nothing published yet.</p>
        ) : (
          <ul>
            {published.map((e) => (
              <li key={e.id}>
                {e.label} · {dateWords(e.date)} · published {momentWords(e.publishedAt)}
              </li>
            ))}
          </ul>
        )}
      </div>
      <form className="panel" onSubmit={submit} aria-labelledby={`${id}-h`}>
        <h2 id={`${id}-h`}>Compare two editions</h2>
        <div className="row">
          {[
            ['Earlier edition', a, setA],
            ['Later edition', b, setB],
          ].map(([label, value, setter], i) => (
            <div className="field" key={i}>
              <label htmlFor={`${id}-${i}`}>{label as string}</label>
              <select id={`${id}-${i}`} value={value as string} onChange={(e) => (setter as (v: string) => void)(e.target.value)} required>
                <option value="">Choose…</option>
                {editions.map((e) => (
                  <option key={e.id} value={e.label}>
                    {e.label} ({dateWords(e.date)})
                  </option>
                ))}
              </select>
            </div>
          ))}
        </div>
        <button type="submit" disabled={a === '' || b === ''}>
          Compare
        </button>
        {error && (
          <p className="error" role="alert">
            Could not compare: {error}
          </p>
        )}
      </form>
      {comparison && (
        <div className="panel" aria-live="polite">
          <h2>
            {comparison.b} against {comparison.a}
          </h2>
          <table>
            <thead>
              <tr>
                <th scope="col">Shelf</th>
                <th scope="col">Added</th>
                <th scope="col">Removed</th>
                <th scope="col">Moved</th>
              </tr>
            </thead>
            <tbody>
              {comparison.shelves.map((s) => (
                <tr key={s.label}>
                  <td>
                    {s.label}
                    {s.presence === 'onlyA' ? ' (only in the earlier one)' : s.presence === 'onlyB' ? ' (new)' : ''}
                  </td>
                  <td>{s.added.map(named).join(', ') || 'none'}</td>
                  <td>{s.removed.map(named).join(', ') || 'none'}</td>
                  <td>{s.moved.map((m) => `${named(m.item)}: slot ${m.from} → ${m.to}`).join(', ') || 'none'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
