import { useId } from 'react';
import type { Brief, CatalogueNames, ShelfView } from '../state/curation-slice.ts';

type StoredBrief = ShelfView['brief'];
export type Facet = 'category' | 'supplier' | 'tag';
type ListKey = 'categories' | 'tags' | 'suppliers';

/** The form's text for a limit: "at most `max` items per `facet`" (value '' = each one), or of one value. */
export interface QuotaDraft {
  facet: Facet;
  value: string;
  max: string;
}

/** Filters and limits as the form holds them: numbers stay text until submit, so half-typed values stay. */
export interface LimitsDraft {
  include: Record<ListKey, string[]>;
  exclude: Record<ListKey, string[]>;
  priceMin: string;
  priceMax: string;
  maxAge: string;
  quotas: QuotaDraft[];
}

const text = (x: number | undefined) => (x === undefined ? '' : String(x));
/** Empty text means "no bound"; anything else goes to the api as a number (the api says what is wrong, in words). */
const optional = (t: string) => (t.trim() === '' ? undefined : Number(t));

export function limitsDraftOf(b: StoredBrief): LimitsDraft {
  return {
    include: { categories: [...b.include.categories], tags: [...b.include.tags], suppliers: [...b.include.suppliers] },
    exclude: { categories: [...b.exclude.categories], tags: [...b.exclude.tags], suppliers: [...b.exclude.suppliers] },
    priceMin: text(b.priceBand.min),
    priceMax: text(b.priceBand.max),
    maxAge: text(b.maxAgeDays),
    quotas: b.rules.quotas.map((q) => ({ facet: q.facet, value: q.value ?? '', max: String(q.max) })),
  };
}

/** The brief's filter and limit fields from the draft; everything else is the caller's. */
export function limitsOf(d: LimitsDraft): Pick<Brief, 'include' | 'exclude' | 'priceBand' | 'maxAgeDays'> & { quotas: NonNullable<Brief['rules']>['quotas'] } {
  const priceBand: { min?: number; max?: number } = {};
  const min = optional(d.priceMin);
  const max = optional(d.priceMax);
  if (min !== undefined) priceBand.min = min;
  if (max !== undefined) priceBand.max = max;
  const age = optional(d.maxAge);
  return {
    include: { ...d.include },
    exclude: { ...d.exclude },
    priceBand,
    ...(age !== undefined && { maxAgeDays: age }),
    quotas: d.quotas.map((q) => ({ facet: q.facet, max: Number(q.max), ...(q.value !== '' && { value: q.value }) })),
  };
}

const FACETS: readonly [Facet, ListKey, string, string][] = [
  ['category', 'categories', 'categories', 'category'],
  ['tag', 'tags', 'tags', 'tag'],
  ['supplier', 'suppliers', 'suppliers', 'supplier'],
];

export function valuesOf(names: CatalogueNames | null, facet: Facet): string[] {
  if (!names) return [];
  return facet === 'category' ? names.categories : facet === 'tag' ? names.tags : names.suppliers;
}

/** A set of names to tick, folded away (a catalogue may have many tags); the summary says how many are ticked. */
function Choice(props: { legend: string; values: string[]; chosen: string[]; onChange(next: string[]): void }) {
  const { legend, values, chosen } = props;
  // A name the brief holds but the catalogue no longer has still shows, so it can be taken off.
  const all = [...values, ...chosen.filter((c) => !values.includes(c))];
  return (
    <details className="choice">
      <summary>
        {legend}: {chosen.length === 0 ? 'any' : chosen.join(', ')}
      </summary>
      <fieldset>
        <legend>{legend}</legend>
        {all.length === 0 && <p className="muted small">The catalogue has none.</p>}
        {all.map((v) => (
          <label key={v} className="check">
            <input
              type="checkbox"
              checked={chosen.includes(v)}
              onChange={(e) => props.onChange(e.target.checked ? [...chosen, v] : chosen.filter((c) => c !== v))}
            />{' '}
            {v}
          </label>
        ))}
      </fieldset>
    </details>
  );
}

/**
 * The brief's filters and limits (DESIGN.md "brief"): only or never these categories, tags and suppliers,
 * a price band, an item-age window, and limits of at most n items per category, supplier or tag (or of one
 * of them). Choices come from the catalogue (`catalogue.names`).
 */
export function BriefLimits(props: { draft: LimitsDraft; names: CatalogueNames | null; onChange(d: LimitsDraft): void; disabled: boolean }) {
  const { draft, names } = props;
  const id = useId();
  const set = (p: Partial<LimitsDraft>) => props.onChange({ ...draft, ...p });
  const setQuota = (k: number, p: Partial<QuotaDraft>) => set({ quotas: draft.quotas.map((q, j) => (j === k ? { ...q, ...p } : q)) });
  return (
    <fieldset disabled={props.disabled}>
      <legend>Filters and limits</legend>
      <div className="row">
        {FACETS.map(([facet, key, plural]) => (
          <Choice key={`in-${key}`} legend={`Only these ${plural}`} values={valuesOf(names, facet)} chosen={draft.include[key]} onChange={(next) => set({ include: { ...draft.include, [key]: next } })} />
        ))}
      </div>
      <div className="row">
        {FACETS.map(([facet, key, plural]) => (
          <Choice key={`out-${key}`} legend={`Leave out these ${plural}`} values={valuesOf(names, facet)} chosen={draft.exclude[key]} onChange={(next) => set({ exclude: { ...draft.exclude, [key]: next } })} />
        ))}
      </div>
      <div className="row">
        <div className="field">
          <label htmlFor={`${id}-pmin`}>Lowest price (empty = no bound)</label>
          <input id={`${id}-pmin`} type="number" min={0} step="any" value={draft.priceMin} onChange={(e) => set({ priceMin: e.target.value })} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-pmax`}>Highest price (empty = no bound)</label>
          <input id={`${id}-pmax`} type="number" min={0} step="any" value={draft.priceMax} onChange={(e) => set({ priceMax: e.target.value })} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-age`}>Added within the last days (empty = any age)</label>
          <input id={`${id}-age`} type="number" min={0} value={draft.maxAge} onChange={(e) => set({ maxAge: e.target.value })} />
        </div>
      </div>
      <fieldset>
        <legend>Limits per category, supplier or tag</legend>
        {draft.quotas.length === 0 && <p className="muted small">No limits.</p>}
        <ol className="limits">
          {draft.quotas.map((q, k) => (
            <li key={k} className="row" aria-label={`Limit ${k + 1}`}>
              <div className="field">
                <label htmlFor={`${id}-q${k}-max`}>Limit {k + 1}: at most (items)</label>
                <input id={`${id}-q${k}-max`} type="number" min={1} value={q.max} onChange={(e) => setQuota(k, { max: e.target.value })} />
              </div>
              <div className="field">
                <label htmlFor={`${id}-q${k}-facet`}>Limit {k + 1}: per</label>
                <select id={`${id}-q${k}-facet`} value={q.facet} onChange={(e) => setQuota(k, { facet: e.target.value as Facet, value: '' })}>
                  {FACETS.map(([f, , , one]) => (
                    <option key={f} value={f}>
                      {one}
                    </option>
                  ))}
                </select>
              </div>
              <div className="field">
                <label htmlFor={`${id}-q${k}-value`}>Limit {k + 1}: which</label>
                <select id={`${id}-q${k}-value`} value={q.value} onChange={(e) => setQuota(k, { value: e.target.value })}>
                  <option value="">each one</option>
                  {[...valuesOf(names, q.facet), ...(q.value && !valuesOf(names, q.facet).includes(q.value) ? [q.value] : [])].map((v) => (
                    <option key={v} value={v}>
                      only {v}
                    </option>
                  ))}
                </select>
              </div>
              <button type="button" className="quiet" onClick={() => set({ quotas: draft.quotas.filter((_, j) => j !== k) })}>
                Remove limit {k + 1}
              </button>
            </li>
          ))}
        </ol>
        <button type="button" className="quiet" onClick={() => set({ quotas: [...draft.quotas, { facet: 'category', value: '', max: '2' }] })}>
          Add a limit
        </button>
      </fieldset>
    </fieldset>
  );
}
