import { useEffect, useId } from 'react';
import type { Brief } from '../state/curation-slice.ts';
import { useApp } from '../state/store.ts';
import { count } from './format.ts';

export type Audience = NonNullable<Brief['audience']>;

/** The form's text for an audience: numbers stay text until submit, so a half-typed value is not lost. */
export interface AudienceDraft {
  kind: Audience['kind'];
  category: string;
  withinDays: string;
  group: string;
  /** The group's name when it has one: the brief then aims at the name, which survives a retraining. */
  groupName?: string;
}

export function draftOf(a: Audience | undefined): AudienceDraft {
  if (a?.kind === 'rule') return { kind: 'rule', category: a.category, withinDays: String(a.withinDays ?? 90), group: '' };
  if (a?.kind === 'group') return { kind: 'group', category: '', withinDays: '90', group: String(a.group), ...(a.name !== undefined && { groupName: a.name }) };
  return { kind: 'everyone', category: '', withinDays: '90', group: '' };
}

/** The audience the draft names; an error in words when a field it needs is missing. */
export function audienceOf(d: AudienceDraft, signalKinds: readonly string[] = ['purchase']): Audience | string {
  if (d.kind === 'everyone') return { kind: 'everyone' };
  if (d.kind === 'rule') {
    const days = Number(d.withinDays);
    if (d.category.trim() === '') return 'Name the category the audience bought in.';
    if (!Number.isFinite(days) || days <= 0) return 'Give the number of days as a number above 0.';
    return { kind: 'rule', category: d.category.trim(), signalKinds: [...signalKinds], withinDays: days };
  }
  if (d.group === '') return 'Choose a taste group.';
  return d.groupName ? { kind: 'group', group: Number(d.group), name: d.groupName } : { kind: 'group', group: Number(d.group) };
}

/** The select's value: a named group by its name (its number changes at each training), else its number. */
const optionOf = (group: number | string, name: string | null | undefined) => (name ? `name:${name}` : String(group));

/**
 * Who the shelf is for: everyone, customers who bought in a category in the last N days, or a taste
 * group found in the iALS customer factors (`audience.groups`, described by their top categories and tags).
 */
export function AudienceField({ draft, onChange, disabled }: { draft: AudienceDraft; onChange(d: AudienceDraft): void; disabled: boolean }) {
  const groups = useApp((s) => s.insight.groups);
  const groupsError = useApp((s) => s.insight.errors.groups);
  const finding = useApp((s) => s.insight.busy.groups ?? false);
  const loadGroups = useApp((s) => s.loadGroups);
  const id = useId();
  useEffect(() => {
    if (draft.kind === 'group' && !groups) void loadGroups();
  }, [draft.kind, groups, loadGroups]);
  const set = (p: Partial<AudienceDraft>) => onChange({ ...draft, ...p });
  const list = groups?.groups ?? [];
  // A named group the last training no longer has still shows, so the editor sees why the shelf says so.
  const lost = draft.groupName && groups && !list.some((g) => g.name === draft.groupName) ? draft.groupName : null;
  const choose = (value: string) => {
    const g = list.find((x) => optionOf(x.group, x.name) === value);
    if (g) set({ group: String(g.group), groupName: g.name ?? '' });
    else if (value === '') set({ group: '', groupName: '' });
  };
  return (
    <fieldset disabled={disabled}>
      <legend>Audience</legend>
      <div className="row">
        {(
          [
            ['everyone', 'Everyone'],
            ['rule', 'Bought in a category recently'],
            ['group', 'A taste group'],
          ] as const
        ).map(([kind, label]) => (
          <label key={kind} className="check">
            <input type="radio" name={`${id}-kind`} value={kind} checked={draft.kind === kind} onChange={() => set({ kind })} /> {label}
          </label>
        ))}
      </div>
      {draft.kind === 'rule' && (
        <div className="row">
          <div className="field">
            <label htmlFor={`${id}-cat`}>Category they bought in</label>
            <input id={`${id}-cat`} value={draft.category} onChange={(e) => set({ category: e.target.value })} placeholder="garden" />
          </div>
          <div className="field">
            <label htmlFor={`${id}-days`}>Within the last (days)</label>
            <input id={`${id}-days`} type="number" min={1} value={draft.withinDays} onChange={(e) => set({ withinDays: e.target.value })} />
          </div>
        </div>
      )}
      {draft.kind === 'group' && (
        <div className="field">
          <label htmlFor={`${id}-g`}>Taste group</label>
          <select id={`${id}-g`} value={draft.group === '' ? '' : optionOf(draft.group, draft.groupName)} onChange={(e) => choose(e.target.value)}>
            <option value="">Choose…</option>
            {lost && (
              <option value={optionOf(draft.group, lost)} disabled>
                “{lost}” (not found after the last training)
              </option>
            )}
            {list.map((g) => (
              <option key={g.group} value={optionOf(g.group, g.name)}>
                {g.name ? `“${g.name}”` : `Group ${g.group + 1}`} ({count(g.customers)} customers): {g.categories.slice(0, 3).map((c) => c.value).join(', ') || 'no categories'}
                {g.tags.length > 0 ? ` · ${g.tags.slice(0, 3).map((t) => t.value).join(', ')}` : ''}
              </option>
            ))}
          </select>
          {finding && (
            <p className="muted small" role="status">
              Finding taste groups in the customers' tastes…
            </p>
          )}
          {groupsError && (
            <p className="error" role="alert">
              Could not list the taste groups: {groupsError} Train the models on the Models screen first.
            </p>
          )}
        </div>
      )}
    </fieldset>
  );
}
