import { useEffect, useId, useState, type FormEvent } from 'react';
import type { AudienceGroups } from '../state/insight-slice.ts';
import { useApp } from '../state/store.ts';
import { count } from '../components/format.ts';

type Group = AudienceGroups['groups'][number];

/**
 * A group whose cohesion is under half the median group's is flagged: on the demo shop the group that
 * gathered short, noisy histories stood out this way (0.13 against about 0.6; rule of thumb, no source).
 * Absolute silhouette readings are shown as numbers only: in 64-dimensional taste vectors even the
 * planted groups score about 0.2.
 */
function loose(g: Group, all: Group[]): boolean {
  const c = all.map((x) => x.cohesion).sort((a, b) => a - b);
  const median = c[Math.floor(c.length / 2)] ?? 0;
  return g.cohesion < 0.5 * median;
}

const two = (x: number | null) => (x === null ? '—' : x.toFixed(2));

function GroupCard({ g, all, shelfOpen }: { g: Group; all: Group[]; shelfOpen: boolean }) {
  const nameGroup = useApp((s) => s.nameGroup);
  const aim = useApp((s) => s.setBrief);
  const brief = useApp((s) => s.curation.edition?.shelves.find((x) => x.label === s.curation.shelf)?.brief ?? null);
  const shelf = useApp((s) => s.curation.shelf);
  const id = useId();
  const [name, setName] = useState(g.name ?? '');
  const [aimed, setAimed] = useState(false);
  const title = g.name ?? `Group ${g.group}`;
  const nearest = all[g.nearest];
  const submit = (e: FormEvent) => {
    e.preventDefault();
    void nameGroup(g.group, name);
  };
  return (
    <article className="panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>
        {title} {g.name && <span className="muted small">group {g.group}</span>}
      </h2>
      {loose(g, all) && <p className="warn">Loose group: its members agree far less than other groups' do; a shelf aimed here has no clear taste to serve.</p>}
      <p>
        <strong>{count(g.customers)}</strong> customers a shelf aimed here would reach · cohesion {two(g.cohesion)} · nearest{' '}
        {nearest ? (nearest.name ?? `group ${nearest.group}`) : '—'} at {two(g.separation)} · silhouette {two(g.silhouette)}
      </p>
      <p className="small">
        Over-used categories: {g.categories.map((c) => `${c.value} ×${c.lift.toFixed(1)}`).join(', ') || '—'}
        <br />
        Over-used tags: {g.tags.map((c) => `${c.value} ×${c.lift.toFixed(1)}`).join(', ') || '—'}
      </p>
      <p className="small">Items this group engages with:</p>
      <ul className="small">
        {g.examples.map((e) => (
          <li key={e.id}>
            {e.title} <span className="muted">({e.category || 'no category'}, {e.id})</span>
          </li>
        ))}
      </ul>
      <form className="row" onSubmit={submit}>
        <div className="field">
          <label htmlFor={`${id}-n`}>Name</label>
          <input id={`${id}-n`} value={name} maxLength={60} onChange={(e) => setName(e.target.value)} />
        </div>
        <div className="toolbar">
          <button type="submit" disabled={name.trim() === '' || name.trim() === g.name}>
            Save name
          </button>
          {g.name && (
            <button type="button" className="quiet" onClick={() => void nameGroup(null, g.name!)}>
              Remove name
            </button>
          )}
          {shelfOpen && brief && (
            <button
              type="button"
              onClick={() => void aim({ ...brief, audience: g.name ? { kind: 'group', group: g.group, name: g.name } : { kind: 'group', group: g.group } }).then((ok) => setAimed(ok))}
            >
              Aim shelf “{shelf}” here
            </button>
          )}
        </div>
      </form>
      {aimed && <p className="small" role="status">Shelf “{shelf}” now reaches this group’s {count(g.customers)} customers.</p>}
    </article>
  );
}

function RangeForm({ groups }: { groups: AudienceGroups }) {
  const save = useApp((s) => s.setGroupSettings);
  const id = useId();
  const [minK, setMinK] = useState(String(groups.settings.minK));
  const [maxK, setMaxK] = useState(String(groups.settings.maxK));
  const [minHistory, setMinHistory] = useState(String(groups.settings.minHistory));
  const submit = (e: FormEvent) => {
    e.preventDefault();
    void save({ minK: Number(minK), maxK: Number(maxK), minHistory: Number(minHistory) });
  };
  const fields: [string, string, (v: string) => void, number][] = [
    ['Fewest groups', minK, setMinK, 2],
    ['Most groups', maxK, setMaxK, 2],
    ['Items a customer needs', minHistory, setMinHistory, 1],
  ];
  return (
    <form className="panel" onSubmit={submit} aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>How groups are found</h2>
      <p className="muted small">The number of groups is the one with the best {groups.criterion}.</p>
      <div className="row">
        {fields.map(([label, value, set, min], i) => (
          <div className="field" key={label}>
            <label htmlFor={`${id}-${i}`}>{label}</label>
            <input id={`${id}-${i}`} type="number" min={min} max={i === 2 ? 1000 : 50} value={value} onChange={(e) => set(e.target.value)} required />
          </div>
        ))}
      </div>
      <button type="submit">Find groups again</button>
    </form>
  );
}

/** The taste groups found in the customers' tastes: sizes, how real each is, what it engages with, names. */
export function Groups() {
  const groups = useApp((s) => s.insight.groups);
  const error = useApp((s) => s.insight.errors.groups);
  const busy = useApp((s) => s.insight.busy.groups ?? false);
  const load = useApp((s) => s.loadGroups);
  const shelfOpen = useApp((s) => s.curation.shelf !== null);
  useEffect(() => {
    void load();
  }, [load]);
  const largest = groups ? Math.max(groups.notEnoughHistory, ...groups.groups.map((g) => g.customers), 1) : 1;
  return (
    <section className="screen" aria-labelledby="groups-screen-h">
      <h1 id="groups-screen-h">Taste groups</h1>
      {busy && <p className="muted">Finding taste groups…</p>}
      {error && (
        <p className="error" role="alert">
          {error}
        </p>
      )}
      {groups && (
        <>
          <div className="panel">
            <h2>Sizes</h2>
            <p className="small">
              {groups.k} groups, chosen between {groups.settings.minK} and {groups.settings.maxK} · mean silhouette {two(groups.silhouette)} · {count(groups.notEnoughHistory)} of {count(groups.customers)} customers
              have too little history yet
            </p>
            <ul className="bars wide" aria-label="Customers per group">
              {[...groups.groups.map((g) => [g.name ?? `Group ${g.group}`, g.customers] as const), ['Not enough history yet', groups.notEnoughHistory] as const].map(
                ([label, n]) => (
                  <li key={label} aria-label={`${label}: ${n} customers`}>
                    <span>{label}</span>
                    <span className="bar-track">
                      <span className="bar-fill" style={{ width: `${(100 * n) / largest}%` }} />
                    </span>
                    <span className="bar-value">{count(n)}</span>
                  </li>
                ),
              )}
            </ul>
            {groups.unmatchedNames.map((n) => (
              <p key={n} className="warn">
                The group named “{n}” is no longer found after the last training (it split, merged or dissolved).
              </p>
            ))}
          </div>
          <RangeForm key={JSON.stringify(groups.settings)} groups={groups} />
          {groups.groups.map((g) => (
            <GroupCard key={`${g.group}:${g.name ?? ''}:${g.customers}`} g={g} all={groups.groups} shelfOpen={shelfOpen} />
          ))}
        </>
      )}
    </section>
  );
}
