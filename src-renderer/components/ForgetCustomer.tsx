import { useId, useState, type FormEvent } from 'react';
import { useApp } from '../state/store.ts';
import { count } from './format.ts';

/**
 * Erase one customer (`customer.forget`): their signals, their row and model rows that held them. Two
 * steps, so a slip of the Enter key erases nothing: name the customer, then confirm in words.
 */
export function ForgetCustomer() {
  const forget = useApp((s) => s.forgetCustomer);
  const busy = useApp((s) => s.insight.busy.forget ?? false);
  const error = useApp((s) => s.insight.errors.forget);
  const done = useApp((s) => s.insight.forgotten);
  const [customer, setCustomer] = useState('');
  const [confirming, setConfirming] = useState(false);
  const id = useId();
  const ask = (e: FormEvent) => {
    e.preventDefault();
    if (customer.trim() !== '') setConfirming(true);
  };
  return (
    <form className="panel" onSubmit={ask} aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Forget a customer</h2>
      <p className="muted small" id={`${id}-note`}>
        Privacy: this workspace and everything in it stays on this machine. Erasing a customer removes their signals, their row and any
        model that kept a row for them, and leaves no trace of them in the workspace file; other models are marked out of date until you
        train again. Backups and copies made outside this app are not reached. Erasure duties differ by country: follow your local law and
        your data-protection adviser, and erase the customer in the systems the files came from too.
      </p>
      <div className="field">
        <label htmlFor={`${id}-c`}>Customer id</label>
        <input
          id={`${id}-c`}
          value={customer}
          onChange={(e) => {
            setCustomer(e.target.value);
            setConfirming(false);
          }}
          aria-describedby={`${id}-note`}
          aria-invalid={error ? true : undefined}
          placeholder="c-1042"
        />
      </div>
      {!confirming ? (
        <button type="submit" className="quiet danger" disabled={busy || customer.trim() === ''}>
          Forget this customer…
        </button>
      ) : (
        <div className="confirm" role="group" aria-label="Confirm forgetting">
          <p>
            Erase customer <strong>{customer.trim()}</strong> and all their signals? This cannot be undone.
          </p>
          <div className="toolbar">
            <button
              type="button"
              className="danger-solid"
              disabled={busy}
              onClick={async () => {
                if (await forget(customer.trim())) setCustomer('');
                setConfirming(false);
              }}
            >
              Yes, erase {customer.trim()}
            </button>
            <button type="button" className="quiet" onClick={() => setConfirming(false)}>
              Keep the customer
            </button>
          </div>
        </div>
      )}
      {error && (
        <p className="error" role="alert">
          Could not forget that customer: {error} Check the id (as in your customers file) and try again.
        </p>
      )}
      {done && !error && (
        <p className="notice" role="status">
          Customer {done.customer} erased: {count(done.signals)} signals removed
          {done.modelsDeleted.length > 0 ? `; models removed: ${done.modelsDeleted.join(', ')}` : ''}
          {done.modelsStale.length > 0 ? `; out of date until retrained: ${done.modelsStale.join(', ')}` : ''}.
          {!done.bytesRemoved && ' The file could not be rewritten yet (another program was reading it): traces may remain until the next training run or opening of the workspace.'}
        </p>
      )}
    </form>
  );
}
