import { useEffect, useId, useState, type FormEvent } from 'react';
import { ForgetCustomer } from '../components/ForgetCustomer.tsx';
import { useApp } from '../state/store.ts';
import { count, dayWords, fileName } from '../components/format.ts';


function Count({ label, value }: { label: string; value: number }) {
  return (
    <div className="count">
      <dt>{label}</dt>
      <dd>{count(value)}</dd>
    </div>
  );
}

/** How long ago, in words a person reads at a glance. */
export function ago(then: number, now: number): string {
  const s = Math.max(0, Math.round((now - then) / 1000));
  if (s < 60) return 'just now';
  const m = Math.round(s / 60);
  if (m < 60) return `${m} min ago`;
  const h = Math.round(m / 60);
  if (h < 48) return `${h} h ago`;
  return `${Math.round(h / 24)} days ago`;
}


function OpenForm() {
  const openWorkspace = useApp((s) => s.openWorkspace);
  const opening = useApp((s) => s.workspace.opening);
  const openError = useApp((s) => s.workspace.openError);
  const [file, setFile] = useState('');
  const [create, setCreate] = useState(false);
  const fileId = useId();
  const errorId = useId();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    void openWorkspace(file.trim(), create);
  };
  return (
    <form className="panel" onSubmit={submit} aria-labelledby={`${fileId}-h`}>
      <h2 id={`${fileId}-h`}>Open another workspace</h2>
      <div className="field">
        <label htmlFor={fileId}>Workspace file (path on this computer)</label>
        <input
          id={fileId}
          value={file}
          onChange={(e) => setFile(e.target.value)}
          placeholder="/home/me/shop.sqlite"
          aria-invalid={openError ? true : undefined}
          aria-describedby={openError ? errorId : undefined}
          required
        />
      </div>
      <label className="check">
        <input type="checkbox" checked={create} onChange={(e) => setCreate(e.target.checked)} /> Create it if it does not exist
      </label>
      {openError && (
        <p id={errorId} className="error" role="alert">
          Could not open that file: {openError}
        </p>
      )}
      <button type="submit" disabled={opening || file.trim() === ''}>
        {opening ? 'Opening…' : 'Open'}
      </button>
    </form>
  );
}

/**
 * In the web shell the page names no file on the machine it runs on (the shell refuses paths: any account
 * there could otherwise open or create any file through it), so another workspace is chosen at launch.
 */
function OtherWorkspace() {
  return (
    <div className="panel" aria-labelledby="other-workspace-h">
      <h2 id="other-workspace-h">Another workspace</h2>
      <p className="muted">
        This window works on the workspace Shelfwright was started with. To open another, stop it and start it again with{' '}
        <code className="command">npm start -- --workspace FILE</code>.
      </p>
    </div>
  );
}

function ModelStatus() {
  const models = useApp((s) => s.models.list);
  const load = useApp((s) => s.loadModels);
  const go = useApp((s) => s.go);
  const open = useApp((s) => s.workspace.info?.open ?? false);
  // Keyed on the file too: opening another workspace while this screen shows reads that one's models.
  const file = useApp((s) => s.workspace.info?.file ?? null);
  useEffect(() => {
    if (open) void load();
  }, [load, open, file]);
  if (!open) return null;
  const stale = models.filter((m) => m.stale).length;
  return (
    <div className="panel" aria-labelledby="model-status-h">
      <h2 id="model-status-h">Models</h2>
      <p>
        {models.length === 0
          ? 'No models trained yet: shelves use popularity and freshness only.'
          : `${models.length} model${models.length === 1 ? '' : 's'} trained${stale > 0 ? `, ${stale} out of date (the data changed since)` : ', all current'}.`}
      </p>
      <button type="button" className="quiet" onClick={() => go('models')}>
        Go to models
      </button>
    </div>
  );
}

/**
 * The workspace by its file name, the way an editor knows it; the full path (often a long or temporary folder)
 * on hover and one click away, not in the way.
 */
function WorkspaceName({ file }: { file: string | null }) {
  if (file === null) return null;
  return (
    <div className="file">
      <h2 className="file-name" title={file}>
        <span className="muted">Workspace</span> {fileName(file)}
      </h2>
      <details className="file-path">
        <summary>Where it is</summary>
        <code>{file}</code>
      </details>
    </div>
  );
}

/** The first screen: which workspace is open, how much it holds, and how fresh these numbers are. */
export function Overview() {
  const info = useApp((s) => s.workspace.info);
  const status = useApp((s) => s.workspace.status);
  const loadError = useApp((s) => s.workspace.loadError);
  const readAt = useApp((s) => s.workspace.readAt);
  const stats = useApp((s) => s.workspace.stats);
  const load = useApp((s) => s.loadWorkspace);
  const canNamePaths = useApp((s) => s.canNamePaths);
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const t = setInterval(() => setNow(Date.now()), 30_000);
    return () => clearInterval(t);
  }, []);

  return (
    <section aria-labelledby="overview-h" className="screen">
      <header className="screen-head">
        <h1 id="overview-h">Workspace overview</h1>
        <button type="button" onClick={() => void load()} disabled={status === 'loading'}>
          Refresh
        </button>
      </header>
      {status === 'error' && (
        <p className="error" role="alert">
          Could not read the workspace: {loadError} Press Refresh to try again.
        </p>
      )}
      {info && !info.open && <p className="notice">No workspace is open. Open or create one below.</p>}
      {info && info.open && (
        <div className="panel">
          <WorkspaceName file={info.file} />
          <dl className="counts" aria-label="What this workspace holds">
            <Count label="Items" value={info.items} />
            <Count label="Customers" value={info.customers} />
            <Count label="Signals" value={info.signals} />
          </dl>
          {stats && (
            <p aria-label="Data freshness">
              {stats.signals === 0
                ? 'No signals yet: import interactions to get personalised candidates.'
                : stats.lastSignalAt === null
                  ? // A shop's export of counts: say what that means rather than "no signals".
                    'No signal has a time: models are measured on a per-customer holdout, and trend and backtests have nothing to read.'
                  : `Signals from ${dayWords(stats.firstSignalAt)} to ${dayWords(stats.lastSignalAt)} (newest ${ago(stats.lastSignalAt, now)})`}
              {stats.lastImportAt !== null ? ` · last import ${ago(stats.lastImportAt, now)}` : ''}
              {` · ${count(stats.availableItems)} items available, ${count(stats.promotedItems)} promoted`}
            </p>
          )}
          {readAt !== null && (
            <p className="muted" aria-live="polite">
              Counts read {ago(readAt, now)} · schema version {info.schemaVersion}
            </p>
          )}
        </div>
      )}
      <ModelStatus />
      {info?.open && <ForgetCustomer />}
      {canNamePaths ? <OpenForm /> : <OtherWorkspace />}
    </section>
  );
}
