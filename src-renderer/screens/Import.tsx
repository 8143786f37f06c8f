import { useId, useState, type FormEvent } from 'react';
import { MAX_UPLOAD_BYTES } from '../../src-main/api/contracts/data.ts';
import { SIGNAL_KINDS } from '../../src-main/core/types.ts';
import type { ImportReport, ImportSource, ImportTarget, SignalKind } from '../state/import-slice.ts';
import { useApp } from '../state/store.ts';
import { count } from '../components/format.ts';
import { EXPECTED_COLUMNS, rejectedCells } from '../components/import-columns.ts';

/**
 * The fields each target can fill. A copy of src-main/ingest/fields.ts FIELDS, which the renderer may not
 * import (layer rule); the preview's detected mapping is checked against the same names on the main side.
 */
const FIELDS: Record<ImportTarget, readonly string[]> = {
  items: ['id', 'title', 'description', 'category', 'tags', 'supplier', 'price', 'added_at', 'promoted', 'available', 'image'],
  customers: ['id'],
  signals: ['customer', 'item', 'kind', 'value', 'at'],
};

function MappingTable({ target, headers, mapping, onChange }: { target: ImportTarget; headers: readonly string[]; mapping: Record<string, string>; onChange(m: Record<string, string>): void }) {
  const id = useId();
  return (
    <table>
      <caption className="muted small">Which column fills each field (detected; change any that are wrong)</caption>
      <thead>
        <tr>
          <th scope="col">Field</th>
          <th scope="col">Column in the file</th>
        </tr>
      </thead>
      <tbody>
        {FIELDS[target].map((f) => (
          <tr key={f}>
            <th scope="row">
              <label htmlFor={`${id}-${f}`}>{f}</label>
            </th>
            <td>
              <select
                id={`${id}-${f}`}
                value={mapping[f] ?? ''}
                onChange={(e) => {
                  const next = { ...mapping };
                  if (e.target.value === '') delete next[f];
                  else next[f] = e.target.value;
                  onChange(next);
                }}
              >
                <option value="">(not in this file)</option>
                {headers.map((h) => (
                  <option key={h} value={h}>
                    {h}
                  </option>
                ))}
              </select>
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** The columns the chosen target expects, before any file is picked: names, whether required, what goes in. */
function ExpectedColumns({ target }: { target: ImportTarget }) {
  return (
    <table className="expected-columns">
      <caption className="muted small">Columns this file should have (headers are matched ignoring case, spaces and underscores)</caption>
      <thead>
        <tr>
          <th scope="col">Column</th>
          <th scope="col">Needed</th>
          <th scope="col">What goes in it</th>
        </tr>
      </thead>
      <tbody>
        {EXPECTED_COLUMNS[target].map((c) => (
          <tr key={c.field}>
            <th scope="row">{c.field}</th>
            <td>{c.required ? 'required' : 'optional'}</td>
            <td>{c.about}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

const megabytes = (bytes: number) => `${(bytes / (1024 * 1024)).toFixed(bytes < 10 * 1024 * 1024 ? 1 : 0)} MB`;

/** Import a catalogue, customers or signals: pick a file, check the mapping and the first rows, import. */
/**
 * After an import that changed the data, the models still describe the data before it: offer the training the
 * Models screen would start (the api's default: tune when the data changed), and go there to follow it.
 */
function RetrainOffer() {
  const trained = useApp((s) => s.models.list.length > 0);
  const running = useApp((s) => s.models.job?.state === 'running');
  const startTraining = useApp((s) => s.startTraining);
  const go = useApp((s) => s.go);
  return (
    <p data-testid="retrain-offer">
      {trained ? 'The models were trained before this import, so proposals do not reflect it yet. ' : 'No models are trained yet. '}
      <button
        type="button"
        disabled={running}
        onClick={() => {
          void startTraining();
          go('models');
        }}
      >
        {trained ? 'Retrain the models now' : 'Train the models now'}
      </button>
    </p>
  );
}

export function Import() {
  const { preview, report, busy, error } = useApp((s) => s.importer);
  const previewImport = useApp((s) => s.previewImport);
  const runImport = useApp((s) => s.runImport);
  const reset = useApp((s) => s.resetImport);
  const [target, setTarget] = useState<ImportTarget>('items');
  const [path, setPath] = useState('');
  const [upload, setUpload] = useState<ImportSource | null>(null);
  const [uploading, setUploading] = useState<string | null>(null);
  const [tooBig, setTooBig] = useState<string | null>(null);
  const canStage = useApp((s) => s.canStageUploads);
  // Only Electron takes a typed path; the web shell refuses paths (another account could name any file).
  const canNamePaths = useApp((s) => s.canNamePaths);
  const stageUpload = useApp((s) => s.stageUpload);
  const [mapping, setMapping] = useState<Record<string, string>>({});
  const [kind, setKind] = useState<SignalKind | ''>('');
  const id = useId();
  const source: ImportSource | null = upload ?? (canNamePaths && path.trim() ? { file: path.trim() } : null);

  const onPreview = async (e: FormEvent) => {
    e.preventDefault();
    if (!source) return;
    // A file looked at afresh: whether it has a kind column is learnt from this preview.
    setKind('');
    await previewImport(source, target);
  };
  const detected = preview?.mapping ?? {};
  const effective = { ...detected, ...mapping };
  // A signal file without a kind column (a shop's export of purchases: customer, item, count) takes one
  // kind for every row; with a kind column the main side refuses a kind for every row, so none is sent.
  const noKindColumn = target === 'signals' && !effective['kind'];
  const everyRowKind = noKindColumn && kind ? { kind } : {};
  const rejected = preview && report && !report.committed ? rejectedCells(report.errors, preview.headers, preview.sampleLines) : new Map<string, string>();
  /** A reported column as the editor knows it: its header beside a CSV column number. */
  const columnName = (c: string | number | null) => (typeof c === 'number' && preview?.headers[c - 1] ? `${c} (${preview.headers[c - 1]})` : (c ?? ''));

  return (
    <section className="screen" aria-labelledby="import-h">
      <h1 id="import-h">Import data</h1>
      <form className="panel" onSubmit={(e) => void onPreview(e)} aria-labelledby={`${id}-h`}>
        <h2 id={`${id}-h`}>1. Choose a file</h2>
        <div className="row">
          <div className="field">
            <label htmlFor={`${id}-t`}>What the file holds</label>
            <select id={`${id}-t`} value={target} onChange={(e) => { setTarget(e.target.value as ImportTarget); setMapping({}); setKind(''); reset(); }}>
              <option value="items">Items (the catalogue)</option>
              <option value="customers">Customers</option>
              <option value="signals">Signals (views, purchases…)</option>
            </select>
          </div>
          {canNamePaths && (
            <div className="field">
              <label htmlFor={`${id}-p`}>Path on this computer</label>
              <input id={`${id}-p`} value={path} onChange={(e) => { setPath(e.target.value); setUpload(null); setTooBig(null); }} placeholder="/home/me/items.csv" />
            </div>
          )}
          <div className="field">
            <label htmlFor={`${id}-u`}>{canNamePaths ? '…or upload a file' : 'Upload a file'} (CSV, JSON, JSON Lines)</label>
            <input
              id={`${id}-u`}
              type="file"
              accept=".csv,.tsv,.txt,.json,.jsonl,.ndjson"
              onChange={async (e) => {
                const f = e.target.files?.[0];
                if (!f) return;
                setPath('');
                setUpload(null);
                setTooBig(null);
                reset();
                if (f.size <= MAX_UPLOAD_BYTES) {
                  setUpload({ fileName: f.name, content: await f.text() });
                  return;
                }
                if (!canStage) {
                  setTooBig(
                    `${f.name} is ${megabytes(f.size)}: files over ${megabytes(MAX_UPLOAD_BYTES)} are not sent through the window here. ` +
                      'Type its path in the field above instead; the app reads it straight from this computer.',
                  );
                  return;
                }
                // A big file goes ahead as a stream, read from disk by the browser, never whole into the page.
                setUploading(`Sending ${f.name} (${megabytes(f.size)}) to Shelfwright…`);
                const staged = await stageUpload(f);
                setUploading(null);
                if (staged) setUpload(staged);
              }}
            />
          </div>
        </div>
        <ExpectedColumns target={target} />
        <button type="submit" disabled={busy || !source}>
          Preview
        </button>
      </form>

      {uploading && (
        <p className="muted small" role="status">
          {uploading}
        </p>
      )}
      {tooBig && (
        <p className="error" role="alert">
          {tooBig}
        </p>
      )}
      {error && (
        <p className="error" role="alert">
          {error} Fix the file or the mapping, then preview again. Nothing was imported.
        </p>
      )}

      {preview && source && (
        <section className="panel" aria-label="Preview">
          <h2>2. Check the columns</h2>
          <p className="muted small">
            Format {preview.format}
            {preview.delimiter ? `, delimiter “${preview.delimiter}”` : ''} · {preview.headers.length} columns
          </p>
          {preview.problems.length > 0 && (
            <ul className="warn" aria-label="Problems found in the preview">
              {preview.problems.map((p, i) => (
                <li key={i}>{p}</li>
              ))}
            </ul>
          )}
          <MappingTable target={target} headers={preview.headers} mapping={effective} onChange={setMapping} />
          {noKindColumn && (
            <div className="field">
              <label htmlFor={`${id}-k`}>The file has no kind column: every row is a…</label>
              <select
                id={`${id}-k`}
                value={kind}
                onChange={(e) => {
                  const k = e.target.value as SignalKind | '';
                  setKind(k);
                  // Look again with the kind, so the problems listed are those of the import to come.
                  if (source) void previewImport(source, target, k ? { kind: k } : {});
                }}
              >
                <option value="">(choose the kind)</option>
                {SIGNAL_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {k}
                  </option>
                ))}
              </select>
            </div>
          )}
          <div className="sample">
            <table>
              <caption className="muted small">First rows of the file</caption>
              <thead>
                <tr>
                  {preview.headers.map((h) => (
                    <th key={h} scope="col">
                      {h}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {preview.sampleRows.slice(0, 8).map((r, i) => (
                  <tr key={i}>
                    {r.map((c, j) => {
                      // A cell the last import rejected is marked in words and outline, not colour alone.
                      const why = rejected.get(`${i}:${j}`);
                      return why === undefined ? (
                        <td key={j}>{c}</td>
                      ) : (
                        <td key={j} className="rejected" aria-invalid="true" title={why}>
                          {c} <span className="rejected-why">(rejected: {why})</span>
                        </td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <h2>3. Import</h2>
          <p className="muted small">All rows go in together: if any row is wrong, nothing is imported and every problem is listed.</p>
          {noKindColumn && !kind && <p className="muted small">Choose the kind of every row above, or the column that holds it, to import.</p>}
          <button
            type="button"
            disabled={busy || (noKindColumn && !kind)}
            onClick={async () => {
              await runImport(source, target, { mapping: effective, ...everyRowKind });
              // The main side removes a streamed file once it is imported (or refused): choose it again to retry.
              if ('upload' in source) setUpload(null);
            }}
          >
            {busy ? 'Importing…' : 'Import'}
          </button>
        </section>
      )}

      {report && (
        <section className={`panel${report.committed ? '' : ' failed'}`} aria-live="polite" aria-label="Import report">
          <h2>{report.committed ? 'Imported' : 'Nothing was imported'}</h2>
          <p>
            {count(report.rows)} rows read · {count(report.added)} added · {count(report.updated)} updated ·{' '}
            {count(report.unchanged)} unchanged · {count(report.rejected)} rejected · {(report.elapsedMs / 1000).toFixed(1)} s
          </p>
          {report.pictures && <p>{picturesLine(report.pictures)}</p>}
          {report.committed && report.added + report.updated > 0 && <RetrainOffer />}
          {report.warnings.map((w) => (
            <p key={w} className="warn">
              Warning: {w}
            </p>
          ))}
          {report.errorCount > 0 && (
            <>
              <p className="error" role="alert">
                {count(report.errorCount)} row problem{report.errorCount === 1 ? '' : 's'} in {report.file}
                {report.committed ? '' : ': correct them and import again.'}
              </p>
              <table>
                <thead>
                  <tr>
                    <th scope="col" className="num">Line</th>
                    <th scope="col">Column</th>
                    <th scope="col">Problem</th>
                  </tr>
                </thead>
                <tbody>
                  {report.errors.slice(0, 50).map((p, i) => (
                    <tr key={i}>
                      <td className="num">{p.line ?? ''}</td>
                      <td>{columnName(p.column)}</td>
                      <td>{p.reason}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {report.errors.length > 50 && <p className="muted small">First 50 shown.</p>}
            </>
          )}
        </section>
      )}
    </section>
  );
}

/** What became of the pictures an items file named, in one line (placeholders are listed as warnings). */
function picturesLine(p: NonNullable<ImportReport['pictures']>): string {
  const placeholders = p.missing + p.broken + p.remote + p.unread;
  return `Pictures: ${p.ready.toLocaleString('en')} of ${p.named.toLocaleString('en')} shown` + (placeholders ? `, ${placeholders.toLocaleString('en')} with a placeholder` : '');
}
