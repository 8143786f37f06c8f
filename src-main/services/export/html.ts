/**
 * A standalone HTML preview of an edition: one file, inline CSS only, no scripts and no outside requests
 * (no fonts or links to anywhere; item pictures are embedded as data: URLs, a neutral box where an item has
 * none), so it opens safely from a mail attachment or a shared drive. Its own content security policy says
 * the same to the browser. All text is HTML-escaped. Sponsored items carry a visible "Sponsored" label in words.
 */
import type { EditionSnapshot } from '../../core/editing/snapshot.ts';
import { DISCLOSURE_NOTE, SPONSORED } from './labels.ts';
import { exportedReadings } from './meter-rows.ts';

/** Escapes the five characters with meaning in HTML text and attribute values. */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

const STYLE = `
body { font: 15px/1.45 system-ui, sans-serif; margin: 2rem auto; max-width: 60rem; color: #1d1d1f; padding: 0 1rem; }
h1 { font-size: 1.5rem; margin-bottom: 0.2rem; }
.date { color: #555; margin-top: 0; }
section { margin: 1.5rem 0; }
h2 { font-size: 1.1rem; border-bottom: 1px solid #ccc; padding-bottom: 0.2rem; }
ol { display: grid; grid-template-columns: repeat(auto-fill, minmax(11rem, 1fr)); gap: 0.6rem; list-style: none; padding: 0; }
li { border: 1px solid #ccc; border-radius: 6px; padding: 0.5rem; }
.pos { color: #555; font-size: 0.8rem; }
.title { font-weight: 600; display: block; }
.meta { color: #555; font-size: 0.85rem; display: block; }
.sponsored { display: inline-block; font-size: 0.75rem; font-weight: 700; border: 1px solid #1d1d1f; border-radius: 3px; padding: 0 0.3rem; margin-top: 0.3rem; }
.empty { color: #777; font-style: italic; }
.pic { display: block; width: 48px; height: 48px; object-fit: contain; border-radius: 4px; background: #eee; margin-bottom: 0.3rem; }
.meter { color: #333; font-size: 0.85rem; }
.meter dl { display: grid; grid-template-columns: max-content max-content 1fr; gap: 0.1rem 0.8rem; margin: 0.4rem 0 0; }
.meter dd { margin: 0; }
footer { color: #555; font-size: 0.85rem; border-top: 1px solid #ccc; padding-top: 0.5rem; }
`;

/** The shelf's meter as a closed disclosure (no script needed): name, value with range, target in words. */
function meterHtml(shelf: EditionSnapshot['shelves'][number]): string {
  const rows = exportedReadings(shelf);
  if (!rows) return '';
  const cells = rows
    .map((r) => {
      const where = r.status === 'no target' ? r.targetText : `${r.targetText}, ${r.status === 'within' ? 'on target' : r.status === 'no data' ? 'no data' : `${r.status} target`}`;
      const range = r.range.startsWith('days') ? '' : ` (${r.range})`;
      return `<dt>${escapeHtml(r.name)}</dt><dd>${escapeHtml(r.text + range)}</dd><dd>${escapeHtml(where)}</dd>`;
    })
    .join('');
  return `\n<details class="meter"><summary>Meter</summary><dl>${cells}</dl></details>`;
}

/**
 * The policy the file carries: nothing may load but images inlined as data: URLs and its own inline style
 * (W3C Content Security Policy Level 3, delivered by <meta http-equiv>).
 */
export const EXPORT_CSP = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'";

/** `pictures`: item external id -> a data: URL (services/pictures.ts); items absent get the placeholder. */
export function editionHtml(e: EditionSnapshot, pictures: ReadonlyMap<string, string> = new Map()): string {
  const picture = (id: string) => {
    const src = pictures.get(id);
    // Only data: URLs are embedded; anything else would be a request the file makes.
    return src?.startsWith('data:image/') ? `<img class="pic" src="${escapeHtml(src)}" alt="">` : '<span class="pic" aria-hidden="true"></span>';
  };
  const shelves = e.shelves
    .map((shelf) => {
      const items = shelf.slots
        .map((s) => {
          if (s.externalId === null) return `<li><span class="pos">${s.slot + 1}</span> <span class="empty">empty</span></li>`;
          const meta = [s.category, s.supplier].filter((x): x is string => !!x).map(escapeHtml).join(' · ');
          const label = s.promoted ? `<span class="sponsored">${SPONSORED}</span>` : '';
          // The label on its own line after the category and supplier, never run into the supplier's name.
          return `<li><span class="pos">${s.slot + 1}</span>${picture(s.externalId)}<span class="title">${escapeHtml(s.title ?? s.externalId)}</span><span class="meta">${meta}</span>${label ? ` ${label}` : ''}</li>`;
        })
        .join('\n');
      return `<section><h2>${escapeHtml(shelf.label)}</h2>\n<ol>\n${items}\n</ol>${meterHtml(shelf)}</section>`;
    })
    .join('\n');
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${EXPORT_CSP}">
<title>${escapeHtml(e.edition.label)}</title>
<style>${STYLE}</style>
</head>
<body>
<h1>${escapeHtml(e.edition.label)}</h1>
<p class="date">${escapeHtml(e.edition.date)}</p>
${shelves}
<footer>${escapeHtml(DISCLOSURE_NOTE)}</footer>
</body>
</html>
`;
}
