/**
 * A standalone HTML preview of an edition: one file, inline CSS only, no scripts and no outside requests
 * (no images, fonts or links to anywhere), so it opens safely from a mail attachment or a shared drive.
 * All text is HTML-escaped. Sponsored items carry a visible "Sponsored" label in words.
 */
import type { EditionSnapshot } from '../../core/editing/snapshot.ts';
import { DISCLOSURE_NOTE, SPONSORED } from './labels.ts';

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
footer { color: #555; font-size: 0.85rem; border-top: 1px solid #ccc; padding-top: 0.5rem; }
`;

export function editionHtml(e: EditionSnapshot): string {
  const shelves = e.shelves
    .map((shelf) => {
      const items = shelf.slots
        .map((s) => {
          if (s.externalId === null) return `<li><span class="pos">${s.slot + 1}</span> <span class="empty">empty</span></li>`;
          const meta = [s.category, s.supplier].filter((x): x is string => !!x).map(escapeHtml).join(' · ');
          const label = s.promoted ? `<span class="sponsored">${SPONSORED}</span>` : '';
          // The label on its own line after the category and supplier, never run into the supplier's name.
          return `<li><span class="pos">${s.slot + 1}</span><span class="title">${escapeHtml(s.title ?? s.externalId)}</span><span class="meta">${meta}</span>${label ? ` ${label}` : ''}</li>`;
        })
        .join('\n');
      return `<section><h2>${escapeHtml(shelf.label)}</h2>\n<ol>\n${items}\n</ol></section>`;
    })
    .join('\n');
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
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
