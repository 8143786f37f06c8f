import { useId, useState, type FormEvent } from 'react';
import { today } from '../components/format.ts';
import { ItemPicture } from '../components/ItemPicture.tsx';
import { useApp } from '../state/store.ts';
import type { PlanView } from '../state/planner-slice.ts';

const num = (x: number | null, d = 2) => (x === null ? '–' : x.toFixed(d));

/** The Monday after today (YYYY-MM-DD, local time): where a plan of the weeks ahead usually starts. */
export function nextMonday(d = new Date()): string {
  const ahead = ((8 - d.getDay()) % 7) || 7;
  return today(new Date(d.getFullYear(), d.getMonth(), d.getDate() + ahead));
}

function PlanForm() {
  const edition = useApp((s) => s.curation.edition);
  const shelves = edition?.shelves.map((x) => x.label) ?? [];
  const go = useApp((s) => s.go);
  const busy = useApp((s) => s.planner.busy);
  const makePlan = useApp((s) => s.makePlan);
  const [shelf, setShelf] = useState('');
  const [more, setMore] = useState('');
  const [start, setStart] = useState(() => nextMonday());
  const [weeks, setWeeks] = useState(6);
  const [name, setName] = useState('');
  const [rest, setRest] = useState('');
  const id = useId();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const others = more.split(',').map((x) => x.trim()).filter(Boolean);
    // A shelf of the open edition plans from that edition; any other name, from the newest edition that has it.
    const fromOpen = edition !== null && shelves.includes(shelf.trim());
    void makePlan({
      shelf: shelf.trim(),
      start,
      weeks,
      ...(fromOpen && { edition: edition.label }),
      ...(name.trim() && { name: name.trim() }),
      ...(others.length > 0 && { shelves: others }),
      ...(rest !== '' && { horizon: { restWeeks: Number(rest) } }),
    });
  };
  return (
    <form className="panel" onSubmit={submit} aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Plan the weeks ahead</h2>
      <div className="row">
        <div className="field">
          <label htmlFor={`${id}-shelf`}>Shelf</label>
          <input id={`${id}-shelf`} list={`${id}-shelves`} value={shelf} onChange={(e) => setShelf(e.target.value)} aria-describedby={`${id}-shelf-hint`} required />
          <datalist id={`${id}-shelves`}>
            {shelves.map((l) => (
              <option key={l} value={l} />
            ))}
          </datalist>
        </div>
        <div className="field">
          <label htmlFor={`${id}-more`}>More shelves (comma-separated)</label>
          <input id={`${id}-more`} value={more} onChange={(e) => setMore(e.target.value)} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-start`}>First week</label>
          <input id={`${id}-start`} type="date" value={start} onChange={(e) => setStart(e.target.value)} required />
        </div>
        <div className="field">
          <label htmlFor={`${id}-weeks`}>Weeks</label>
          <input id={`${id}-weeks`} type="number" min={1} max={52} value={weeks} onChange={(e) => setWeeks(Number(e.target.value))} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-rest`}>Rest weeks</label>
          <input
            id={`${id}-rest`}
            type="number"
            min={0}
            max={51}
            value={rest}
            placeholder="brief's"
            onChange={(e) => setRest(e.target.value)}
            aria-describedby={`${id}-rest-hint`}
          />
        </div>
        <div className="field">
          <label htmlFor={`${id}-name`}>Plan name</label>
          <input id={`${id}-name`} value={name} onChange={(e) => setName(e.target.value)} />
        </div>
      </div>
      <p id={`${id}-rest-hint`} className="muted">
        Rest weeks: how many weeks an item sits out before it runs again (empty: the shelf brief's rest period; 0 lets it run week after week).
      </p>
      <p id={`${id}-shelf-hint`} className="muted">
        {edition && shelves.length > 0 ? (
          <>A shelf of the open edition “{edition.label}” ({shelves.join(', ')}) keeps its brief in the plan; another name is taken from the newest edition that has it.</>
        ) : (
          <>
            The planner plans a shelf you have set up in an edition, with its brief.{' '}
            {edition ? `The open edition “${edition.label}” has no shelves yet.` : 'No edition is open.'} Type a shelf's name, or{' '}
            <button type="button" className="quiet" onClick={() => go('editions')}>
              go to Editions
            </button>{' '}
            to open or start one.
          </>
        )}
      </p>
      <button type="submit" disabled={busy || shelf.trim() === '' || start === ''}>
        {busy ? 'Solving…' : 'Plan'}
      </button>
    </form>
  );
}

/**
 * A plan's heading: its name, then what it plans unless the name already says it (a plan named by no one is
 * called "<shelves> from <start>", and the heading said that twice).
 */
export function planHeading(plan: Pick<PlanView, 'name' | 'shelves' | 'start'>): string {
  const what = `${plan.shelves.join(', ')} from ${plan.start}`;
  return plan.name === what || plan.name === `${plan.shelves.join(' + ')} from ${plan.start}` ? what : `${plan.name}: ${what}`;
}

/** One shelf's calendar: weeks across, slots down. Sponsored items say so in words. */
function Calendar({ plan, shelf }: { plan: PlanView; shelf: number }) {
  const label = plan.shelves[shelf]!;
  const busy = useApp((s) => s.planner.busy);
  const pin = useApp((s) => s.pinInPlan);
  const lock = useApp((s) => s.lockPlanWeek);
  const ban = useApp((s) => s.banFromPlan);
  const size = plan.weeks[0]?.shelves[shelf]?.slots.length ?? 0;
  return (
    <table className="plan-calendar" aria-label={`Plan for ${label}`}>
      <thead>
        <tr>
          <th scope="col">Slot</th>
          {plan.weeks.map((w) => (
            <th scope="col" key={w.week}>
              Week {w.week} <small>{w.date}</small>
              {w.locked.includes(label) ? (
                <span> (locked)</span>
              ) : (
                <button type="button" disabled={busy} onClick={() => void lock(w.week, label)} aria-label={`Lock week ${w.week} of ${label}`}>
                  Lock
                </button>
              )}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {Array.from({ length: size }, (_, k) => (
          <tr key={k}>
            <th scope="row">{k + 1}</th>
            {plan.weeks.map((w) => {
              const x = w.shelves[shelf]!.slots[k]!;
              if (x.item === null) return <td key={w.week}>(empty)</td>;
              return (
                <td key={w.week} data-item={x.item}>
                  {/* The picture shares a line with the id and marks, so the title below has the cell's whole width. */}
                  <span className="cell-head">
                    <ItemPicture item={x.item} size="cell" /> <small>{x.item}</small>
                    {x.promoted && <span className="sponsored">Sponsored</span>}
                  </span>
                  <span className="cell-title">{x.title}</span>
                  {x.pinned && <strong className="pinned"> (pinned)</strong>}
                  <span className="cell-actions">
                    <button type="button" disabled={busy || x.pinned} onClick={() => void pin(x.item!, w.week, label)} aria-label={`Pin ${x.title} (${x.item}) to week ${w.week}`}>
                      Pin
                    </button>
                    <button type="button" disabled={busy} onClick={() => void ban(x.item!)} aria-label={`Ban ${x.title} (${x.item}) from the plan`}>
                      Ban
                    </button>
                  </span>
                </td>
              );
            })}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/**
 * Pins any item to any week: the calendar's own Pin keeps an item where the solver put it, this puts a chosen
 * item into a chosen week. The item is named by id or by the title of an item already in the plan.
 */
function PinForm({ plan }: { plan: PlanView }) {
  const pin = useApp((s) => s.pinInPlan);
  const busy = useApp((s) => s.planner.busy);
  const [item, setItem] = useState('');
  const [week, setWeek] = useState(1);
  const [chosen, setShelf] = useState(plan.shelves[0]!);
  const shelf = plan.shelves.includes(chosen) ? chosen : plan.shelves[0]!;
  const id = useId();
  const known = new Map<string, string>();
  for (const w of plan.weeks) for (const sh of w.shelves) for (const x of sh.slots) if (x.item !== null) known.set(x.item, x.title ?? x.item);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const typed = item.trim();
    const byTitle = [...known].find(([, t]) => t === typed)?.[0];
    void pin(known.has(typed) ? typed : (byTitle ?? typed), Math.min(week, plan.weeks.length), shelf);
  };
  return (
    <form onSubmit={submit} aria-labelledby={`${id}-h`}>
      <h3 id={`${id}-h`}>Pin an item to a week</h3>
      <div className="row">
        <div className="field">
          <label htmlFor={`${id}-item`}>Item (id or title)</label>
          <input id={`${id}-item`} list={`${id}-items`} value={item} onChange={(e) => setItem(e.target.value)} required />
          <datalist id={`${id}-items`}>
            {[...known].map(([x, t]) => (
              <option key={x} value={x} label={t} />
            ))}
          </datalist>
        </div>
        <div className="field">
          <label htmlFor={`${id}-week`}>Week</label>
          <select id={`${id}-week`} value={Math.min(week, plan.weeks.length)} onChange={(e) => setWeek(Number(e.target.value))}>
            {plan.weeks.map((w) => (
              <option key={w.week} value={w.week}>
                Week {w.week} ({w.date})
              </option>
            ))}
          </select>
        </div>
        {plan.shelves.length > 1 && (
          <div className="field">
            <label htmlFor={`${id}-on`}>On shelf</label>
            <select id={`${id}-on`} value={shelf} onChange={(e) => setShelf(e.target.value)}>
              {plan.shelves.map((l) => (
                <option key={l} value={l}>
                  {l}
                </option>
              ))}
            </select>
          </div>
        )}
      </div>
      <button type="submit" disabled={busy || item.trim() === ''}>
        Pin and re-solve
      </button>
    </form>
  );
}

function Meter({ plan }: { plan: PlanView }) {
  const draft = useApp((s) => s.draftPlanWeek);
  const busy = useApp((s) => s.planner.busy);
  const open = useApp((s) => s.openEdition);
  const go = useApp((s) => s.go);
  return (
    <table aria-label="Plan meter">
      <thead>
        <tr>
          <th scope="col">Week</th>
          <th scope="col">Distinct items</th>
          <th scope="col">Supplier Gini</th>
          <th scope="col">Relevance</th>
          <th scope="col">Seasonal fit</th>
          <th scope="col">Value</th>
          <th scope="col">Draft</th>
        </tr>
      </thead>
      <tbody>
        {plan.weeks.map((w) => {
          const d = plan.drafts.find((x) => x.week === w.week);
          return (
            <tr key={w.week}>
              <th scope="row">{w.week}</th>
              <td>{w.meter.distinctItems}</td>
              <td>{num(w.meter.supplierGini)}</td>
              <td>{num(w.meter.relevance)}</td>
              <td>{num(w.meter.seasonalFit)}</td>
              <td>{num(w.meter.value)}</td>
              <td>
                {d ? (
                  <button type="button" className="quiet" aria-label={`Open draft edition ${d.edition}`} onClick={async () => (await open(d.edition)) && go('board')}>
                    {d.edition}
                  </button>
                ) : (
                  <button type="button" disabled={busy || plan.status === 'infeasible'} onClick={() => void draft(w.week)}>
                    Make draft of week {w.week}
                  </button>
                )}
              </td>
            </tr>
          );
        })}
        {plan.horizon && (
          <tr>
            <th scope="row">Horizon</th>
            <td>{plan.horizon.distinctItems}</td>
            <td>{num(plan.horizon.supplierGini)}</td>
            <td>{num(plan.horizon.relevance)}</td>
            <td>{num(plan.horizon.seasonalFit)}</td>
            <td>weakest {num(plan.horizon.weakestWeekValue)}</td>
            <td />
          </tr>
        )}
      </tbody>
    </table>
  );
}

export function Planner() {
  const plan = useApp((s) => s.planner.plan);
  const error = useApp((s) => s.planner.error);
  const message = useApp((s) => s.planner.message);
  const busy = useApp((s) => s.planner.busy);
  const resolve = useApp((s) => s.resolvePlan);
  return (
    <section className="screen" aria-labelledby="planner-h">
      <header className="screen-head">
        <h1 id="planner-h">Planner</h1>
      </header>
      <PlanForm />
      {error && (
        <p className="error" role="alert">
          {error}
        </p>
      )}
      {/* One live region, always present, so a screen reader hears both "solving" and what the solve did. */}
      <p role="status" className={busy || message ? 'notice' : 'sr-only'}>
        {busy ? 'Solving… a plan over many weeks can take a few seconds.' : message}
      </p>
      {plan === null && !busy && <p className="muted">No plan yet. Name a shelf and its first week above, then Plan: the calendar of the weeks ahead appears here.</p>}
      {plan && (
        <div className="panel" aria-busy={busy}>
          <h2>{planHeading(plan)}</h2>
          <p>
            Solved {plan.method === 'exact' ? 'exactly' : 'by the heuristic'} ({plan.status}) over the best {plan.candidates.toLocaleString('en')} of {plan.pool.toLocaleString('en')} items.{' '}
            <button type="button" disabled={busy} onClick={() => void resolve()}>
              Re-solve
            </button>
          </p>
          {plan.notes.length > 0 && (
            <ul aria-label="Notes on this plan" className="muted">
              {plan.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          )}
          {plan.diagnosis && (
            <div role="alert">
              <p>The rules cannot all hold; this plan breaks some and was not stored. Each of these alone makes a plan possible:</p>
              <ul>
                {plan.diagnosis.relaxations.map((r) => (
                  <li key={r.family}>{r.description}</li>
                ))}
              </ul>
            </div>
          )}
          {plan.shelves.map((l, s) => (
            <div className="plan-scroll" key={l} role="region" aria-label={`Calendar of ${l}`} tabIndex={0}>
              <Calendar plan={plan} shelf={s} />
            </div>
          ))}
          <PinForm plan={plan} />
          <div className="plan-scroll" role="region" aria-label="Meter per week" tabIndex={0}>
            <Meter plan={plan} />
          </div>
          {plan.forecast && (
            <p>
              Seasonal fit: {plan.forecast.method}; on the last {plan.forecast.heldOutWeeks} weeks, MASE {num(plan.forecast.categories.mase)} for categories (seasonal naive{' '}
              {num(plan.forecast.categories.baselineMase)}).
            </p>
          )}
        </div>
      )}
    </section>
  );
}
