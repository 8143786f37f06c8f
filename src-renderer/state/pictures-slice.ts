import type { StateCreator } from 'zustand';
import { MAX_PICTURES_PER_CALL } from '../../src-main/api/contracts/pictures.ts';
import type { Client } from '../client/client.ts';
import type { AppState } from './store.ts';

export interface PicturesSlice {
  pictures: {
    /**
     * Item external id -> its thumbnail as a data: URL, or null: no picture, or not answered yet (the neutral
     * placeholder either way). An id absent here has not been asked for.
     */
    byItem: Readonly<Record<string, string | null>>;
  };
  /** Asks for the thumbnails of items not asked for yet; the asks of one render go out as one call. */
  wantPictures(items: readonly string[]): void;
  /** Forgets every thumbnail (after an import, which may have changed them): the screens ask again. */
  forgetPictures(): void;
}

export const initialPictures: PicturesSlice['pictures'] = { byItem: {} };

export function createPicturesSlice(client: Client): StateCreator<AppState, [], [], PicturesSlice> {
  let batch: string[] = [];
  return (set, get) => {
    async function flush(items: string[]) {
      for (let at = 0; at < items.length; at += MAX_PICTURES_PER_CALL) {
        try {
          const r = await client.call('item.pictures', { items: items.slice(at, at + MAX_PICTURES_PER_CALL) });
          const found = Object.fromEntries(r.pictures.filter((p) => p.src !== null).map((p) => [p.item, p.src]));
          // Only ids still asked for: a forgetPictures in between wins over an answer to the earlier ask.
          set((s) => ({ pictures: { byItem: { ...s.pictures.byItem, ...keep(found, s.pictures.byItem) } } }));
        } catch {
          // Pictures are extra: the placeholders stay; the next import or workspace asks again.
        }
      }
    }
    return {
      pictures: initialPictures,
      wantPictures(items) {
        const known = get().pictures.byItem;
        const fresh = [...new Set(items)].filter((id) => !(id in known));
        if (fresh.length === 0) return;
        // Marked as asked at once (null: placeholder), so the next render does not ask again.
        set((s) => ({ pictures: { byItem: { ...s.pictures.byItem, ...Object.fromEntries(fresh.map((id) => [id, null])) } } }));
        if (batch.length === 0) {
          queueMicrotask(() => {
            const items = batch;
            batch = [];
            void flush(items);
          });
        }
        batch.push(...fresh);
      },
      forgetPictures() {
        set({ pictures: initialPictures });
      },
    };
  };
}

function keep(found: Record<string, string | null>, asked: Readonly<Record<string, string | null>>): Record<string, string | null> {
  return Object.fromEntries(Object.entries(found).filter(([id]) => id in asked));
}
