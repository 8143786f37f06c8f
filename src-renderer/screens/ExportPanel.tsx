import { useId, useState } from 'react';
import type { ExportFormat } from '../state/curation-slice.ts';
import { useApp } from '../state/store.ts';
import { count } from '../components/format.ts';

const TYPES: Record<ExportFormat, string> = { csv: 'text/csv', json: 'application/json', html: 'text/html' };

/** Saves through a Blob and a download link: no network, works in Electron and in the browser. */
function download(filename: string, content: string, type: string): void {
  const url = URL.createObjectURL(new Blob([content], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  a.click();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

export function ExportPanel() {
  const exportEdition = useApp((s) => s.exportEdition);
  const error = useApp((s) => s.curation.errors.export);
  const exported = useApp((s) => s.curation.exported);
  const [format, setFormat] = useState<ExportFormat>('csv');
  const id = useId();
  return (
    <section className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Export</h2>
      <div className="row">
        <div className="field">
          <label htmlFor={`${id}-f`}>Format</label>
          <select id={`${id}-f`} value={format} onChange={(e) => setFormat(e.target.value as ExportFormat)}>
            <option value="csv">CSV (spreadsheet)</option>
            <option value="json">JSON</option>
            <option value="html">HTML preview</option>
          </select>
        </div>
      </div>
      <button
        type="button"
        onClick={async () => {
          const r = await exportEdition(format);
          if (r) download(r.filename, r.content, TYPES[r.format]);
          // A CSV is a bare table; its columns and the sponsored disclosure are saved beside it.
          if (r?.notes) download(r.notes.filename, r.notes.content, 'text/plain');
        }}
      >
        Export edition
      </button>
      {error && (
        <p className="error" role="alert">
          Could not export: {error}
        </p>
      )}
      {exported && (
        <p className="muted" aria-live="polite">
          Saved {exported.filename} ({count(exported.content.length)} characters){exported.notes ? ` and its notes, ${exported.notes.filename}` : ''}.
        </p>
      )}
    </section>
  );
}
