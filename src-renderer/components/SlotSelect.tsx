import type { ShelfView } from '../state/curation-slice.ts';

/** A labelled choice of one of the shelf's slots (numbered from 1, as on screen). */
export function SlotSelect({ id, label, shelf, value, onChange }: { id: string; label: string; shelf: ShelfView; value: number; onChange(slot: number): void }) {
  return (
    <div className="field">
      <label htmlFor={id}>{label}</label>
      <select id={id} value={value} onChange={(e) => onChange(Number(e.target.value))}>
        {shelf.slots.map((s) => (
          <option key={s.slot} value={s.slot}>
            {s.slot}
          </option>
        ))}
      </select>
    </div>
  );
}
