import { useId, useState } from 'react';
import { bandFor, READINGS, TARGET_KEYS, type Band, type BandSource, type TargetKey, type Targets } from '../../src-main/core/curation/readings.ts';
import { useApp } from '../state/store.ts';

/** A band end as typed: shares in percent, the rest in the reading's own unit; '' = open. */
function toText(key: TargetKey, v: number | undefined): string {
  if (v === undefined) return '';
  return READINGS[key].unit === 'share' ? String(Math.round(v * 1000) / 10) : String(v);
}

function fromText(key: TargetKey, t: string): number | undefined {
  if (t.trim() === '') return undefined;
  const n = Number(t);
  return READINGS[key].unit === 'share' ? n / 100 : n;
}

/**
 * The meter's target bands for this shelf (`shelf.targets`): "at least" and "at most" per reading, in the
 * reading's own unit. Saving does not refill the shelf; the server checks the ranges and says what is wrong.
 */
export function TargetsForm({ brief, disabled }: { brief: BandSource; disabled: boolean }) {
  // Open or closed survives a save: the fields below start again from the saved bands (keyed on them).
  const [open, setOpen] = useState(false);
  return (
    <details className="targets" open={open} onToggle={(e) => setOpen((e.currentTarget as HTMLDetailsElement).open)}>
      <summary>Set targets for this shelf</summary>
      <TargetFields key={JSON.stringify([brief.targets ?? null, brief.rules.promoted])} brief={brief} disabled={disabled} />
    </details>
  );
}

function TargetFields({ brief, disabled }: { brief: BandSource; disabled: boolean }) {
  const setTargets = useApp((s) => s.setTargets);
  const busy = useApp((s) => s.curation.busy);
  const error = useApp((s) => s.curation.errors.targets);
  const id = useId();
  const initial = () =>
    Object.fromEntries(
      TARGET_KEYS.map((k) => {
        const b = bandFor(brief, k);
        return [k, { min: toText(k, b.min), max: toText(k, b.max) }];
      }),
    ) as Record<TargetKey, { min: string; max: string }>;
  const [text, setText] = useState(initial);
  const save = () => {
    const targets: Targets = {};
    for (const k of TARGET_KEYS) {
      const b: Band = {};
      const lo = fromText(k, text[k].min);
      const hi = fromText(k, text[k].max);
      if (lo !== undefined) b.min = lo;
      if (hi !== undefined) b.max = hi;
      targets[k] = b;
    }
    void setTargets(targets);
  };
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        save();
      }}
    >
      <p className="small muted">Leave an end empty for no limit. Shares are in percent; median age in days. Sponsored shares follow the brief’s sponsored limits.</p>
      <table className="targets-table">
        <thead>
          <tr>
            <th scope="col">Reading</th>
            <th scope="col">At least</th>
            <th scope="col">At most</th>
          </tr>
        </thead>
        <tbody>
          {TARGET_KEYS.map((k) => {
            const spec = READINGS[k];
            const unit = spec.unit === 'share' ? '%' : spec.unit === 'days' ? 'days' : '0–1';
            return (
              <tr key={k}>
                <th scope="row" id={`${id}-${k}`}>
                  {spec.name} <span className="muted small">({unit})</span>
                </th>
                {(['min', 'max'] as const).map((end) => (
                  <td key={end}>
                    <input
                      type="number"
                      inputMode="decimal"
                      step="any"
                      aria-label={`${spec.name}, ${end === 'min' ? 'at least' : 'at most'}${spec.unit === 'share' ? ' (percent)' : spec.unit === 'days' ? ' (days)' : ''}`}
                      value={text[k][end]}
                      disabled={disabled}
                      onChange={(e) => setText((t) => ({ ...t, [k]: { ...t[k], [end]: e.target.value } }))}
                    />
                  </td>
                ))}
              </tr>
            );
          })}
        </tbody>
      </table>
      <div className="toolbar">
        <button type="submit" disabled={disabled || busy}>
          Save targets
        </button>
        <button type="button" className="quiet" disabled={disabled || busy} onClick={() => void setTargets({})}>
          Back to defaults
        </button>
      </div>
      {error && (
        <p className="error" role="alert">
          Targets not saved: {error}
        </p>
      )}
    </form>
  );
}
