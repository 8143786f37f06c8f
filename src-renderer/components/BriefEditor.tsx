import { useEffect, useId, useState, type FormEvent } from 'react';
import type { Brief, ShelfView } from '../state/curation-slice.ts';
import { useApp } from '../state/store.ts';
import { AudienceField, audienceOf, draftOf } from './AudienceField.tsx';
import { BriefLimits, limitsDraftOf, limitsOf } from './BriefLimits.tsx';

type StoredBrief = ShelfView['brief'];

/** Empty text means "no limit"; anything else must be a number in range (checked again by the api). */
function optionalShare(text: string): number | undefined {
  return text.trim() === '' ? undefined : Number(text) / 100;
}

/**
 * The shelf's brief: size, the relevance/variety balance (MMR's λ, Carbonell & Goldstein 1998), the
 * sponsored-share ceiling, the rest period, the audience, and the filters and limits (BriefLimits). The rest
 * of the brief (weights, anchors, other sponsored bounds) is kept as it was. Applying is one undoable action
 * that keeps the list where the new brief allows; Refill starts over.
 */
export function BriefEditor({ brief, disabled }: { brief: StoredBrief; disabled: boolean }) {
  const setBrief = useApp((s) => s.setBrief);
  const error = useApp((s) => s.curation.errors.brief);
  const busy = useApp((s) => s.curation.busy);
  const names = useApp((s) => s.curation.names);
  const loadNames = useApp((s) => s.loadNames);
  const id = useId();
  // Read on each opening of a shelf: an import since may have brought new categories, tags or suppliers.
  useEffect(() => void loadNames(), [loadNames]);
  const [size, setSize] = useState(String(brief.size));
  const [lambda, setLambda] = useState(String(brief.lambda));
  const [maxSponsored, setMaxSponsored] = useState(brief.rules.promoted.maxCount === undefined ? '' : String(Math.round(brief.rules.promoted.maxCount * 100)));
  const [rest, setRest] = useState(String(brief.rules.restPeriod));
  const [limits, setLimits] = useState(() => limitsDraftOf(brief));
  const [audience, setAudience] = useState(() => draftOf(brief.audience));
  const [audienceError, setAudienceError] = useState<string | null>(null);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const who = audienceOf(audience, brief.audience.kind === 'rule' ? brief.audience.signalKinds : undefined);
    setAudienceError(typeof who === 'string' ? who : null);
    if (typeof who === 'string') return;
    const { quotas, ...filters } = limitsOf(limits);
    const maxCount = optionalShare(maxSponsored);
    const promoted = { ...brief.rules.promoted };
    if (maxCount === undefined) delete promoted.maxCount;
    else promoted.maxCount = maxCount;
    const next: Brief = {
      ...brief,
      ...filters,
      size: Number(size),
      audience: who,
      lambda: Number(lambda),
      rules: { ...brief.rules, quotas, promoted, restPeriod: Number(rest) },
    };
    // An emptied age field takes the window off (the spread above keeps the old one otherwise).
    if (filters.maxAgeDays === undefined) delete next.maxAgeDays;
    void setBrief(next);
  };

  return (
    <form className="panel" onSubmit={submit} aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Rules</h2>
      <div className="row">
        <div className="field">
          <label htmlFor={`${id}-size`}>Slots</label>
          <input id={`${id}-size`} type="number" min={1} max={200} value={size} onChange={(e) => setSize(e.target.value)} disabled={disabled} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-lambda`}>Relevance vs variety (0–1, 1 = relevance only)</label>
          <input id={`${id}-lambda`} type="number" min={0} max={1} step={0.05} value={lambda} onChange={(e) => setLambda(e.target.value)} disabled={disabled} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-spons`}>Most sponsored slots (% of shelf, empty = no limit)</label>
          <input id={`${id}-spons`} type="number" min={0} max={100} value={maxSponsored} onChange={(e) => setMaxSponsored(e.target.value)} disabled={disabled} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-rest`}>Rest period (published editions)</label>
          <input id={`${id}-rest`} type="number" min={0} value={rest} onChange={(e) => setRest(e.target.value)} disabled={disabled} />
        </div>
      </div>
      <BriefLimits draft={limits} names={names} onChange={setLimits} disabled={disabled} />
      <AudienceField draft={audience} onChange={setAudience} disabled={disabled} />
      {audienceError && (
        <p className="error" role="alert">
          {audienceError}
        </p>
      )}
      {error && (
        <p className="error" role="alert">
          Could not apply the rules: {error}
        </p>
      )}
      <button type="submit" disabled={disabled || busy}>
        Apply rules
      </button>
      <p className="muted small">Applying keeps the list where the new rules allow, and can be undone; Refill starts over.</p>
    </form>
  );
}
