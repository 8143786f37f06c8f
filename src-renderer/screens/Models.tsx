import { useEffect, useId, useMemo, useState } from 'react';
import { HoldoutPanel } from '../components/HoldoutPanel.tsx';
import { modelShortWords } from '../components/model-short.ts';
import { MetricsChart } from '../components/MetricsChart.tsx';
import { num, pct, momentWords, count } from '../components/format.ts';
import { useApp } from '../state/store.ts';
import { Notes } from '../components/Notes.tsx';
import { TrainPanel } from '../components/TrainPanel.tsx';
import { tuningSummary } from '../components/tuning-words.ts';
import { metricHelp, modelWords } from '../../src-main/core/models/model-words.ts';
import { SPLIT_CHOICES, SPLIT_CHOICE_WORDS, type SplitChoice } from '../../src-main/core/eval/split-choice.ts';

function EvaluationPanel() {
  const evaluation = useApp((s) => s.models.evaluation);
  const error = useApp((s) => s.models.errors.evaluate);
  const running = useApp((s) => s.models.job?.state === 'running');
  const start = useApp((s) => s.startEvaluation);
  const [k, setK] = useState(10);
  const [split, setSplit] = useState<SplitChoice>('auto');
  const id = useId();
  const rows = evaluation?.rows ?? [];
  const labels = useMemo(() => rows.map((r) => modelShortWords(r.model)), [rows]);
  const series = useMemo(
    () => [
      { name: `NDCG@${evaluation?.k ?? k}`, values: rows.map((r) => r.ndcg), color: '#24605a' },
      { name: `Recall@${evaluation?.k ?? k}`, values: rows.map((r) => r.recall), color: '#8a5412' },
    ],
    [rows, evaluation?.k, k],
  );
  return (
    <section className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Evaluation: models against baselines</h2>
      <div className="row">
        <div className="field">
          <label htmlFor={`${id}-k`}>List length K</label>
          <input id={`${id}-k`} type="number" min={1} max={200} value={k} onChange={(e) => setK(Number(e.target.value))} />
        </div>
        {/* A shop's export of counts has no times: then only a per-customer holdout can measure anything. */}
        <div className="field">
          <label htmlFor={`${id}-split`}>Held out</label>
          <select id={`${id}-split`} value={split} onChange={(e) => setSplit(e.target.value as SplitChoice)}>
            {SPLIT_CHOICES.map((c) => (
              <option key={c} value={c}>
                {capitalise(SPLIT_CHOICE_WORDS[c])}
              </option>
            ))}
          </select>
        </div>
      </div>
      <button type="button" disabled={running} onClick={() => void start(k, split)}>
        Evaluate
      </button>
      {error && (
        <p className="error" role="alert">
          {error}
        </p>
      )}
      {evaluation ? (
        <>
          {/* Kept after a retrain, so the last figures stay in view; said in words when they no longer measure what is in use. */}
          {evaluation.stale && <p className="warn">Out of date: {evaluation.staleReason ?? 'the workspace changed since this evaluation; evaluate again'}.</p>}
          {/* Seven columns do not fit an 800 px window: the table scrolls sideways in its own region, not the page. */}
          <div className="table-scroll" role="region" aria-label="Evaluation figures" tabIndex={0}>
          <table>
            <caption className="muted small">
              Held-out test: {count(evaluation.split.test)} signals · evaluated {momentWords(evaluation.evaluatedAt)}
              <br />
              <span data-testid="split-words">Split: {evaluation.split.why ?? 'by time'}</span>
            </caption>
            <thead>
              <tr>
                <th scope="col">Model</th>
                <th scope="col" className="num">NDCG@{evaluation.k}</th>
                <th scope="col" className="num">Recall@{evaluation.k}</th>
                <th scope="col" className="num">Precision@{evaluation.k}</th>
                <th scope="col" className="num">MAP</th>
                <th scope="col" className="num">Coverage</th>
                <th scope="col" className="num">Customers</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.model}>
                  <th scope="row">{modelWords(r.model)}</th>
                  <td className="num">{num(r.ndcg, 3)}</td>
                  <td className="num">{num(r.recall, 3)}</td>
                  <td className="num">{num(r.precision, 3)}</td>
                  <td className="num">{num(r.map, 3)}</td>
                  <td className="num">{pct(r.coverage)}</td>
                  <td className="num">{count(r.customers)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          </div>
          <dl className="metric-help small" aria-label="What each figure measures">
            {metricHelp(evaluation.k).map((m) => (
              <div key={m.metric}>
                <dt>{m.metric}</dt>
                <dd>{m.help}</dd>
              </div>
            ))}
          </dl>
          <MetricsChart labels={labels} series={series} title={`Models and baselines at K = ${evaluation.k}`} />
          <Notes notes={evaluation.notes} />
        </>
      ) : (
        <p className="muted">No evaluation yet. Train the models, then evaluate.</p>
      )}
    </section>
  );
}

/** Model status, training with progress and cancel, and the offline evaluation. */
export function Models() {
  const list = useApp((s) => s.models.list);
  const hybrid = useApp((s) => s.models.hybrid);
  const error = useApp((s) => s.models.errors.list);
  const load = useApp((s) => s.loadModels);
  useEffect(() => {
    void load();
  }, [load]);
  return (
    <section className="screen" aria-labelledby="models-h">
      <h1 id="models-h">Models</h1>
      {error && (
        <p className="error" role="alert">
          Could not read the models: {error}
        </p>
      )}
      <TrainPanel />
      <section className="panel" aria-label="Trained models">
        <h2>Trained models</h2>
        {list.length === 0 ? (
          <p className="muted">None yet: shelves are filled from popularity and freshness until models are trained.</p>
        ) : (
          // With the tuning and its notes the table is wider than an 800 px window: it scrolls in its own region.
          <div className="table-scroll" role="region" aria-label="Each model's training and tuning" tabIndex={0}>
          <table>
            <thead>
              <tr>
                <th scope="col">Model</th>
                <th scope="col">Trained</th>
                <th scope="col" className="num">Time</th>
                <th scope="col">Status</th>
                <th scope="col">Tuning</th>
                <th scope="col">Notes</th>
              </tr>
            </thead>
            <tbody>
              {list.map((m) => (
                <tr key={m.id}>
                  <th scope="row">{modelWords(m.kind)}</th>
                  {/* A model trained elsewhere says where it came from, in words (docs/cluster.md). */}
                  <td>{m.origin ? capitalise(m.origin.description) : momentWords(m.trainedAt)}</td>
                  <td className="num">{m.origin ? '–' : `${(m.trainMs / 1000).toFixed(1)} s`}</td>
                  <td>
                    {m.stale
                      ? m.origin
                        ? 'Out of date: the data changed since the signals were exported; export and fit again'
                        : 'Out of date: the data changed since training'
                      : 'Current'}
                  </td>
                  {/* How its settings were chosen, with the tuner's notes in full beside it (why not tuned, what a rule decided). */}
                  <td className="tuning-cell">
                    {tuningSummary(m)}
                    {m.tuningNotes.length > 0 && (
                      <ul className="small" aria-label={`Tuning notes: ${modelShortWords(m.kind)}`}>
                        {m.tuningNotes.map((n, i) => (
                          <li key={i}>{n}</li>
                        ))}
                      </ul>
                    )}
                  </td>
                  <td>
                    {m.notes.length === 0 ? (
                      '–'
                    ) : (
                      <details>
                        <summary>{m.notes.length === 1 ? '1 note' : `${m.notes.length} notes`}</summary>
                        <Notes notes={m.notes} />
                      </details>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          </div>
        )}
        {hybrid && (
          <p data-testid="hybrid-line">
            <strong>Hybrid:</strong> {hybrid.reason}
            {hybrid.stale ? ' (the data changed since: retrain)' : ''}
          </p>
        )}
      </section>
      <EvaluationPanel />
      <HoldoutPanel />
    </section>
  );
}

const capitalise = (t: string): string => t.charAt(0).toUpperCase() + t.slice(1);
