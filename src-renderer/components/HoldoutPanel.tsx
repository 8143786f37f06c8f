import { plural } from '../../src-main/core/util/plural.ts';
import { useId, useMemo, useState, type FormEvent } from 'react';
import { useApp } from '../state/store.ts';
import { num, pct } from './format.ts';
import { modelShortWords } from './model-short.ts';
import { MetricsChart } from './MetricsChart.tsx';
import { Notes } from './Notes.tsx';
import { modelWords } from '../../src-main/core/models/model-words.ts';

/**
 * "Evaluate against a file": the editor brings held-out pairs (customer, item; CSV or JSON Lines, mapped
 * like a signal import) and every trained model is scored on exactly those pairs (`evaluate.holdout`).
 * Unknown customers and items are counted on screen, never dropped in silence.
 */
export function HoldoutPanel() {
  const result = useApp((s) => s.insight.holdout);
  const busy = useApp((s) => s.insight.busy.holdout ?? false);
  const error = useApp((s) => s.insight.errors.holdout);
  const evaluate = useApp((s) => s.evaluateHoldout);
  const [file, setFile] = useState<{ name: string; content: string } | null>(null);
  const [k, setK] = useState(20);
  const id = useId();
  const rows = result?.models ?? [];
  const labels = useMemo(() => rows.map((r) => modelShortWords(r.model)), [rows]);
  const series = useMemo(
    () => [
      { name: `NDCG@${result?.k ?? k}`, values: rows.map((r) => r.ndcg), color: '#24605a' },
      { name: `Recall@${result?.k ?? k}`, values: rows.map((r) => r.recall), color: '#8a5412' },
      { name: `HitRate@${result?.k ?? k}`, values: rows.map((r) => r.hitRate), color: '#1b4f8a' },
    ],
    [rows, result?.k, k],
  );
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (file) void evaluate(file.name, file.content, k);
  };
  return (
    <section className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Evaluate against a file</h2>
      <p className="muted small">
        Bring interactions that really happened after your data ends (customer and item columns; CSV or JSON Lines). Every trained model is
        scored on exactly those pairs; items a customer already has here are left out of their ranking.
      </p>
      <form onSubmit={submit}>
        <div className="row">
          <div className="field">
            <label htmlFor={`${id}-f`}>Held-out file</label>
            <input
              id={`${id}-f`}
              type="file"
              accept=".csv,.tsv,.txt,.jsonl,.ndjson,.json"
              aria-describedby={error ? `${id}-e` : undefined}
              onChange={async (e) => {
                const f = e.target.files?.[0];
                setFile(f ? { name: f.name, content: await f.text() } : null);
              }}
            />
          </div>
          <div className="field">
            <label htmlFor={`${id}-k`}>List length K</label>
            <input id={`${id}-k`} type="number" min={1} max={500} value={k} onChange={(e) => setK(Number(e.target.value))} />
          </div>
        </div>
        <button type="submit" disabled={busy || !file}>
          {busy ? 'Scoring…' : 'Evaluate against this file'}
        </button>
      </form>
      {error && (
        <p id={`${id}-e`} className="error" role="alert">
          Could not evaluate against that file: {error} Check that it has customer and item columns, then try again.
        </p>
      )}
      {result && (
        <div aria-live="polite">
          <p aria-label="Holdout summary">
            {result.file}: {plural(result.rows, 'row')}, {plural(result.pairs, 'pair')} for {plural(result.customers, 'customer')} ·{' '}
            <strong>{plural(result.unknownCustomers.distinct, 'unknown customer')}</strong> ({plural(result.unknownCustomers.rows, 'row')}) ·{' '}
            <strong>{plural(result.unknownItems.distinct, 'unknown item')}</strong> ({plural(result.unknownItems.rows, 'row')}) ·{' '}
            {plural(result.alreadyInWorkspace, 'pair')} already in the workspace
          </p>
          <div className="table-scroll" role="region" aria-label="Figures on the file" tabIndex={0}>
          <table aria-label="Models scored on the file">
            <thead>
              <tr>
                <th scope="col">Model</th>
                <th scope="col" className="num">NDCG@{result.k}</th>
                <th scope="col" className="num">Recall@{result.k}</th>
                <th scope="col" className="num">HitRate@{result.k}</th>
                <th scope="col" className="num">Coverage@{result.k}</th>
                <th scope="col" className="num">Novelty (bits)</th>
                <th scope="col">Status</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.model}>
                  <th scope="row">{modelWords(r.model)}</th>
                  <td className="num">{num(r.ndcg, 3)}</td>
                  <td className="num">{num(r.recall, 3)}</td>
                  <td className="num">{num(r.hitRate, 3)}</td>
                  <td className="num">{pct(r.coverage)}</td>
                  <td className="num">{num(r.novelty, 1)}</td>
                  <td>{r.stale === null ? 'baseline or blend' : r.stale ? 'Out of date' : 'Current'}</td>
                </tr>
              ))}
            </tbody>
          </table>
          </div>
          <MetricsChart labels={labels} series={series} title={`Scored on ${result.file} at K = ${result.k}`} />
          <Notes notes={result.notes} />
        </div>
      )}
    </section>
  );
}
