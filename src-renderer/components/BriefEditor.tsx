import { useId, useState, type FormEvent } from 'react';
import type { Brief, ShelfView } from '../state/curation-slice.ts';
import { useApp } from '../state/store.ts';
import { AudienceField, audienceOf, draftOf } from './AudienceField.tsx';

type StoredBrief = ShelfView['brief'];

/** Empty text means "no limit"; anything else must be a number in range (checked again by the api). */
function optionalShare(text: string): number | undefined {
  return text.trim() === '' ? undefined : Number(text) / 100;
}

/**
 * The shelf's rules: size, the relevance/variety balance (MMR's λ, Carbonell & Goldstein 1998), the
 * sponsored-share ceiling, the rest period and one quota per category. The rest of the brief is kept
 * as it was.
 */
export function BriefEditor({ brief, disabled }: { brief: StoredBrief; disabled: boolean }) {
  const setBrief = useApp((s) => s.setBrief);
  const error = useApp((s) => s.curation.errors.brief);
  const busy = useApp((s) => s.curation.busy);
  const id = useId();
  const categoryQuota = brief.rules.quotas.find((q) => q.facet === 'category' && q.value === undefined);
  const [size, setSize] = useState(String(brief.size));
  const [lambda, setLambda] = useState(String(brief.lambda));
  const [maxSponsored, setMaxSponsored] = useState(brief.rules.promoted.maxCount === undefined ? '' : String(Math.round(brief.rules.promoted.maxCount * 100)));
  const [rest, setRest] = useState(String(brief.rules.restPeriod));
  const [perCategory, setPerCategory] = useState(categoryQuota ? String(categoryQuota.max) : '');
  const [audience, setAudience] = useState(() => draftOf(brief.audience));
  const [audienceError, setAudienceError] = useState<string | null>(null);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const who = audienceOf(audience, brief.audience.kind === 'rule' ? brief.audience.signalKinds : undefined);
    setAudienceError(typeof who === 'string' ? who : null);
    if (typeof who === 'string') return;
    const quotas = brief.rules.quotas.filter((q) => !(q.facet === 'category' && q.value === undefined));
    if (perCategory.trim() !== '') quotas.push({ facet: 'category', max: Number(perCategory) });
    const maxCount = optionalShare(maxSponsored);
    const promoted = { ...brief.rules.promoted };
    if (maxCount === undefined) delete promoted.maxCount;
    else promoted.maxCount = maxCount;
    const next: Brief = {
      ...brief,
      size: Number(size),
      audience: who,
      lambda: Number(lambda),
      rules: { ...brief.rules, quotas, promoted, restPeriod: Number(rest) },
    };
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
        <div className="field">
          <label htmlFor={`${id}-quota`}>Most items per category (empty = no limit)</label>
          <input id={`${id}-quota`} type="number" min={1} value={perCategory} onChange={(e) => setPerCategory(e.target.value)} disabled={disabled} />
        </div>
      </div>
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
        Apply rules and refill
      </button>
    </form>
  );
}
