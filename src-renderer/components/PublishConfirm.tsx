import { useEffect, useId, useRef } from 'react';
import type { EditionView } from '../state/curation-slice.ts';
import { publishCheck } from '../state/publish-check.ts';

/**
 * Asks before an edition is frozen (publishing cannot be undone), listing what the editor may not have seen:
 * rules not met and shelves never opened. Focus starts on "Keep editing", the safe choice.
 */
export function PublishConfirm(props: { edition: EditionView; opened: readonly string[]; busy: boolean; onPublish(): void; onCancel(): void }) {
  const { unmet, unopened } = publishCheck(props.edition, props.opened);
  const id = useId();
  const cancel = useRef<HTMLButtonElement>(null);
  useEffect(() => cancel.current?.focus(), []);
  return (
    <div
      className="panel confirm"
      role="alertdialog"
      aria-labelledby={`${id}-h`}
      aria-describedby={`${id}-d`}
      onKeyDown={(e) => {
        if (e.key === 'Escape') props.onCancel();
      }}
    >
      <h2 id={`${id}-h`}>Publish {props.edition.label}?</h2>
      <p id={`${id}-d`}>Publishing freezes the edition: its shelves can no longer be changed, only read, compared and exported.</p>
      {unmet.length === 0 ? (
        <p>Every shelf meets its rules.</p>
      ) : (
        <div className="warn">
          <p>
            {unmet.length} rule{unmet.length === 1 ? ' is' : 's are'} not met:
          </p>
          <ul aria-label="Rules not met">
            {unmet.map((u, i) => (
              <li key={i}>
                {u.shelf} — {u.title}: {u.reason}
              </li>
            ))}
          </ul>
        </div>
      )}
      {unopened.length === 0 ? (
        <p>Every shelf has been opened.</p>
      ) : (
        <div className="warn">
          <p>
            {unopened.length === 1 ? 'One shelf was' : `${unopened.length} shelves were`} never opened (not opened in the shelf editor here, and no
            action on it):
          </p>
          <ul aria-label="Shelves never opened">
            {unopened.map((s) => (
              <li key={s}>{s}</li>
            ))}
          </ul>
        </div>
      )}
      <div className="row">
        <button type="button" disabled={props.busy} onClick={props.onPublish}>
          Publish now
        </button>
        <button type="button" className="quiet" ref={cancel} onClick={props.onCancel}>
          Keep editing
        </button>
      </div>
    </div>
  );
}
