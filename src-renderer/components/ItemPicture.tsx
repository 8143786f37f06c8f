import { useEffect } from 'react';
import { useApp } from '../state/store.ts';

/** Drawn sizes in CSS pixels: a slot card, a pool row, a planner calendar cell, a board line. Thumbnails are stored at 96 px at most. */
const SIZES = { slot: 48, pool: 40, cell: 32, mini: 20 } as const;

/**
 * An item's thumbnail, or a neutral placeholder of the same size when it has none (or while it is asked for).
 * The picture is a data: URL given by the api, so the page fetches nothing. Decorative (empty alt): the
 * item's title is always written beside it.
 */
export function ItemPicture({ item, size }: { item: string | null | undefined; size: keyof typeof SIZES }) {
  // undefined: not asked for yet (or forgotten after an import): asked again.
  const src = useApp((s) => (item ? s.pictures.byItem[item] : null));
  const want = useApp((s) => s.wantPictures);
  useEffect(() => {
    if (item && src === undefined) want([item]);
  }, [item, src, want]);
  const px = SIZES[size];
  return src ? (
    <img className={`thumb thumb-${size}`} src={src} alt="" width={px} height={px} />
  ) : (
    <span className={`thumb thumb-${size} thumb-none`} aria-hidden="true" data-placeholder="" />
  );
}
