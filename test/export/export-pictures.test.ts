import { describe, expect, it } from 'vitest';
import { parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import type { EditionSnapshot } from '../../src-main/core/editing/snapshot.ts';
import { makeThumbnail } from '../../src-main/ingest/thumbnail.ts';
import { EXPORT_CSP, exportEdition } from '../../src-main/services/export/index.ts';
import { PictureRepo } from '../../src-main/store/pictures.ts';
import { handPng, webpSize } from '../ingest/png.ts';
import { seededHarness } from '../renderer/seed.ts';

/** Every src and href value in a document, whatever the quoting. */
const addresses = (html: string) => [...html.matchAll(/\b(?:src|href)\s*=\s*["']?([^"'\s>]+)/gi)].map((m) => m[1]!);

describe('the HTML export with item pictures', () => {
  const snapshot: EditionSnapshot = {
    edition: { id: 1, label: 'Week 10', date: '2026-03-02' },
    publishedAt: 0,
    shelves: [{
      label: 'Front', position: 1, brief: parseBrief({ size: 2 }), meter: null, violations: [],
      slots: [
        { slot: 0, itemId: 1, externalId: 'a1', title: 'Moss Lantern', category: 'lamps', supplier: 'Mossgate', promoted: false, pinned: false, score: 1, percentile: 1 },
        { slot: 1, itemId: 2, externalId: 'a2', title: 'Tin Orchard', category: 'lamps', supplier: 'Mossgate', promoted: false, pinned: false, score: 1, percentile: 1 },
      ],
    }],
    editionMeter: null,
  };

  it('embeds data: pictures, draws a placeholder for an item without one, and never names an outside address', () => {
    const html = exportEdition(snapshot, 'html', new Map([['a1', 'data:image/webp;base64,UklGRg=='], ['a2', 'https://pictures.example/a2.jpg']]));
    expect(html).toContain('<img class="pic" src="data:image/webp;base64,UklGRg==" alt="">');
    expect(html.match(/<span class="pic" aria-hidden="true"><\/span>/g)).toHaveLength(1);
    expect(addresses(html)).toEqual(['data:image/webp;base64,UklGRg==']);
    expect(html).not.toContain('pictures.example');
  });

  it('carries a content security policy that lets nothing load but data: images and its inline style', () => {
    const html = exportEdition(snapshot, 'html');
    expect(html).toContain(`<meta http-equiv="Content-Security-Policy" content="${EXPORT_CSP}">`);
    // W3C CSP Level 3: default-src 'none' blocks every fetch directive not named; img-src allows data: only.
    const directives = new Map(EXPORT_CSP.split(';').map((d) => d.trim().split(/\s+/)).map(([k, ...v]) => [k!, v]));
    expect(directives.get('default-src')).toEqual(["'none'"]);
    expect(directives.get('img-src')).toEqual(['data:']);
    expect([...directives.keys()].filter((k) => k.endsWith('-src')).sort()).toEqual(['default-src', 'img-src', 'style-src']);
  });

  it("through the api: an edition's export embeds the stored thumbnail's own bytes", async () => {
    const h = seededHarness();
    try {
      const made = await makeThumbnail(handPng(64, 64, (x) => (x < 32 ? [200, 40, 40] : [40, 40, 200])));
      if (!made.ok) throw new Error(made.reason);
      const repo = new PictureRepo(h.ctx.db);
      repo.putThumb({ hash: 'f'.repeat(64), recipe: 1, ...made.thumb });
      for (let i = 1; i <= 12; i += 2) repo.setPicture(`i-${i}`, 'pics/x.png', 'ready', 'f'.repeat(64));
      await h.client.call('edition.new', { label: 'Week 49', date: '2026-12-07' });
      await h.client.call('shelf.add', { edition: 'Week 49', label: 'Row', brief: { size: 6 } });
      const out = await h.client.call('edition.export', { edition: 'Week 49', format: 'html' });
      const srcs = addresses(out.content);
      expect(srcs.length).toBeGreaterThan(0);
      for (const s of srcs) {
        expect(s.startsWith('data:image/webp;base64,')).toBe(true);
        const bytes = Buffer.from(s.slice('data:image/webp;base64,'.length), 'base64');
        expect(bytes.equals(made.thumb.data)).toBe(true);
        expect(webpSize(bytes)).toMatchObject({ width: 64, height: 64 }); // RFC 9649 container
      }
      const items = out.content.match(/<li>/g)!.length;
      const placeholders = out.content.match(/<span class="pic" aria-hidden="true">/g)?.length ?? 0;
      expect(srcs.length + placeholders).toBe(items);
    } finally {
      h.close();
    }
  });
});
