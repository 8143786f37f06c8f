import { useState } from 'react';
import {
  DndContext,
  DragOverlay,
  KeyboardSensor,
  PointerSensor,
  closestCenter,
  pointerWithin,
  useSensor,
  useSensors,
  type CollisionDetection,
  type DragEndEvent,
} from '@dnd-kit/core';
import { SortableContext, sortableKeyboardCoordinates, useSortable, verticalListSortingStrategy } from '@dnd-kit/sortable';
import type { ShelfAction, ShelfView } from '../state/curation-slice.ts';
import type { changeMarks } from './change-words.ts';
import { reasonWords } from '../../src-main/core/curation/reason-words.ts';
import { rankWords, screenNumbers } from './format.ts';
import { ItemPicture } from './ItemPicture.tsx';

type Slot = ShelfView['slots'][number];
type Mark = ReturnType<typeof changeMarks> extends Map<string, infer M> ? M : never;

/**
 * Component contributions as labelled bars, second to the reason. Every row draws on one scale (`scale`:
 * the largest contribution on the shelf), so a longer bar in one row is a larger part than a shorter one in
 * another; the numbers are in the text too.
 */
export function ExplanationBars({ contributions, scale }: { contributions: Record<string, number>; scale: number }) {
  const entries = Object.entries(contributions).filter(([, v]) => Number.isFinite(v) && v > 0);
  if (entries.length === 0) return <p className="muted small">No score parts (placed by hand).</p>;
  const full = Math.max(1e-9, scale);
  return (
    <ul className="bars" aria-label="Parts of the score">
      {entries.map(([k, v]) => (
        <li key={k}>
          <span className="bar-label">{k}</span>
          <span className="bar-track" aria-hidden="true">
            <span className="bar-fill" style={{ width: `${Math.min(1, v / full) * 100}%` }} />
          </span>
          <span className="bar-value">{v.toFixed(2)}</span>
        </li>
      ))}
    </ul>
  );
}

/** The largest contribution on the shelf: the one scale its bars share. */
export function barScale(slots: readonly { contributions: Record<string, number> }[]): number {
  let m = 0;
  for (const s of slots) for (const v of Object.values(s.contributions)) if (Number.isFinite(v) && v > m) m = v;
  return m;
}

interface RowProps {
  slot: Slot;
  readOnly: boolean;
  /** An action is in flight: no move may start until its result is shown (a move names slots by position). */
  busy: boolean;
  /** How the last change touched this item, if it did: shown in words, not colour alone. */
  mark: Mark | undefined;
  poolSize: number;
  scale: number;
  onAct(action: ShelfAction): void;
}

function SlotRow({ slot, readOnly, busy, mark, poolSize, scale, onAct }: RowProps) {
  // Busy only disables the sortable (aria-disabled on the handle), not the button, so keyboard focus stays put.
  const { attributes, listeners, setNodeRef, transform, transition, isDragging } = useSortable({
    id: sortId(slot),
    disabled: readOnly || busy || !slot.item,
  });
  const style = {
    transform: transform ? `translate3d(${transform.x}px, ${transform.y}px, 0)` : undefined,
    transition,
    // The card stays in the list as the drop's placeholder; the overlay follows the pointer.
    opacity: isDragging ? 0.4 : 1,
  };
  const name = slot.title ?? `slot ${slot.slot}`;
  const item = slot.item;
  return (
    <li
      ref={setNodeRef}
      style={style}
      className={`slot${slot.pinned ? ' pinned' : ''}${mark ? ' changed' : ''}`}
      aria-label={`Slot ${slot.slot}: ${name}`}
    >
      <button type="button" className="handle" aria-label={`Move ${name} (slot ${slot.slot})`} disabled={readOnly || !item} {...attributes} {...listeners}>
        ⋮⋮
      </button>
      <span className="slot-no">{slot.slot}</span>
      <div className="slot-main">
        <ItemPicture item={item} size="slot" />
        <p className="slot-title">
          {slot.title ?? <span className="muted">Empty: no candidate meets the brief</span>}{' '}
          {slot.promoted && <span className="sponsored">Sponsored</span>} {slot.pinned && <span className="tag">Pinned</span>}{' '}
          {mark?.kind === 'entered' && <span className="tag change">New here</span>}
          {mark?.kind === 'moved' && <span className="tag change">Was slot {mark.from}</span>}
        </p>
        {item && (
          <p className="reason">{slot.reason ? reasonWords(slot.reason, screenNumbers) : <span className="muted">No part of its score has evidence to show in words.</span>}</p>
        )}
        {item && (
          <p className="muted small">
            {slot.category || 'no category'} · {slot.supplier || 'no supplier'} · {rankWords(slot.rank, poolSize)}
          </p>
        )}
        {item && <ExplanationBars contributions={slot.contributions} scale={scale} />}
      </div>
      {item && !readOnly && (
        <div className="slot-actions" role="group" aria-label={`Actions for ${name}`}>
          {slot.pinned ? (
            <button type="button" className="quiet" onClick={() => onAct({ kind: 'unpin', slot: slot.slot })}>
              Unpin
            </button>
          ) : (
            <button type="button" className="quiet" onClick={() => onAct({ kind: 'pin', slot: slot.slot, item })}>
              Pin
            </button>
          )}
          <button type="button" className="quiet" onClick={() => onAct({ kind: 'boost', item, factor: 1.5 })}>
            Boost
          </button>
          <button type="button" className="quiet" onClick={() => onAct({ kind: 'sink', item, factor: 1.5 })}>
            Sink
          </button>
          <button type="button" className="quiet danger" onClick={() => onAct({ kind: 'ban', item, scope: 'shelf' })}>
            Ban
          </button>
        </div>
      )}
    </li>
  );
}

/** A slot's drag id: its item, so a card keeps its id when the list re-renders after a move. */
function sortId(s: Slot): string {
  return s.item === null ? `empty-${s.slot}` : `item-${s.item}`;
}

/**
 * A mouse drop lands on the slot under the pointer (the sortable rects being where the cards sit); the
 * keyboard has no pointer, so it keeps closestCenter on the card it moves, as before.
 */
const dropTarget: CollisionDetection = (args) => {
  if (!args.pointerCoordinates) return closestCenter(args);
  const under = pointerWithin(args);
  return under.length > 0 ? under : closestCenter(args);
};

/**
 * The slots, reorderable by pointer or keyboard (space to lift, arrows to move, space to drop: dnd-kit's
 * KeyboardSensor with sortableKeyboardCoordinates). A drop becomes one `move` action, so undo covers it.
 */
export function SlotList({
  slots,
  readOnly,
  busy = false,
  marks = new Map(),
  poolSize,
  onAct,
}: {
  slots: readonly Slot[];
  readOnly: boolean;
  busy?: boolean;
  marks?: ReadonlyMap<string, Mark>;
  /** Candidates in the pool the ranks are counted in. */
  poolSize: number;
  onAct(a: ShelfAction): void;
}) {
  // A small distance before a drag starts, so a click on the handle is not a drag.
  const sensors = useSensors(useSensor(PointerSensor, { activationConstraint: { distance: 4 } }), useSensor(KeyboardSensor, { coordinateGetter: sortableKeyboardCoordinates }));
  const [dragging, setDragging] = useState<string | null>(null);
  const byId = (id: string | number) => slots.find((s) => sortId(s) === String(id));
  const slotNo = (id: string | number) => byId(id)?.slot ?? 0;
  const onDragEnd = (e: DragEndEvent) => {
    setDragging(null);
    if (!e.over || e.active.id === e.over.id) return;
    const from = slotNo(e.active.id);
    const to = slotNo(e.over.id);
    if (from > 0 && to > 0 && from !== to) onAct({ kind: 'move', from, to });
  };
  const title = (id: string | number) => byId(id)?.title ?? `slot ${slotNo(id)}`;
  /** Dropping on a pinned slot moves its pinned item to the dragged card's slot: said before the drop. */
  const pinnedNote = (active: string | number, over: string | number) => {
    const target = byId(over);
    return target?.pinned && String(over) !== String(active)
      ? ` Slot ${target.slot} holds pinned ${target.title}; dropping here moves it to slot ${slotNo(active)}.`
      : '';
  };
  // Spoken in words an editor uses (dnd-kit's live region); the defaults speak internal ids.
  const announcements = {
    onDragStart: ({ active }: { active: { id: string | number } }) => `Picked up ${title(active.id)} from slot ${slotNo(active.id)}.`,
    onDragOver: ({ active, over }: { active: { id: string | number }; over: { id: string | number } | null }) =>
      over ? `${title(active.id)} is over slot ${slotNo(over.id)}.${pinnedNote(active.id, over.id)}` : `${title(active.id)} is not over a slot.`,
    onDragEnd: ({ active, over }: { active: { id: string | number }; over: { id: string | number } | null }) =>
      over ? `${title(active.id)} dropped at slot ${slotNo(over.id)}.${pinnedNote(active.id, over.id)}` : `${title(active.id)} put back.`,
    onDragCancel: ({ active }: { active: { id: string | number } }) => `Move cancelled; ${title(active.id)} stays in slot ${slotNo(active.id)}.`,
  };
  const lifted = dragging === null ? undefined : byId(dragging);
  const scale = barScale(slots);
  const screenReaderInstructions = {
    draggable: 'To move an item, press Space, use the arrow keys to choose a slot, then press Space again. Escape cancels.',
  };
  return (
    <DndContext
      sensors={sensors}
      collisionDetection={dropTarget}
      onDragStart={(e) => setDragging(String(e.active.id))}
      onDragCancel={() => setDragging(null)}
      onDragEnd={onDragEnd}
      accessibility={{ announcements, screenReaderInstructions }}
    >
      <SortableContext items={slots.map(sortId)} strategy={verticalListSortingStrategy}>
        <ol className="slots" aria-label="Slots">
          {slots.map((s) => (
            <SlotRow key={sortId(s)} slot={s} readOnly={readOnly} busy={busy} mark={s.item === null ? undefined : marks.get(s.item)} poolSize={poolSize} scale={scale} onAct={onAct} />
          ))}
        </ol>
      </SortableContext>
      {/* The card in hand, drawn above everything so it never vanishes behind a panel while dragged. */}
      <DragOverlay>{lifted ? <div className="slot drag-overlay" aria-hidden="true"><span className="slot-no">{lifted.slot}</span><p className="slot-title">{lifted.title}</p></div> : null}</DragOverlay>
    </DndContext>
  );
}
