import { z } from 'zod';
import { method } from '../define.ts';

/** The most items one call asks for: a pool page, a shelf and a board fit well inside it. */
export const MAX_PICTURES_PER_CALL = 500;

/**
 * A thumbnail the page can show without a request: only a base64 `data:` URL of the two formats the
 * importer stores. Checked on every response, so no address the page would fetch can ever reach an <img>.
 */
export const PictureDataUrl = z.string().regex(/^data:image\/(webp|png);base64,[A-Za-z0-9+/]+=*$/);

export const pictureMethods = {
  'item.pictures': method({
    summary: "the given items' thumbnails as data: URLs; null where an item has none (the page shows a placeholder)",
    request: z.object({ items: z.array(z.string().min(1)).max(MAX_PICTURES_PER_CALL) }).strict(),
    response: z.object({ pictures: z.array(z.object({ item: z.string(), src: PictureDataUrl.nullable() })) }),
  }),
} as const;
