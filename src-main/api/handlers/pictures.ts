import type { AppContext } from '../../services/context.ts';
import { pictureUrls } from '../../services/pictures.ts';
import type { Handler } from '../handler-table.ts';

export function pictureHandlers(ctx: AppContext): { 'item.pictures': Handler<'item.pictures'> } {
  return {
    'item.pictures': (r) => {
      const urls = pictureUrls(ctx.db, r.items);
      return { pictures: r.items.map((item) => ({ item, src: urls.get(item) ?? null })) };
    },
  };
}
