import { describe, expect, it } from 'vitest';
import { CONTENT_SECURITY_POLICY } from '../../src-main/shell/web/guard.ts';
import { PictureDataUrl } from '../../src-main/api/contracts/pictures.ts';

/** Directive -> sources, as W3C Content Security Policy Level 3 ("parse a serialized CSP") splits them. */
const directives = new Map(CONTENT_SECURITY_POLICY.split(';').map((d) => d.trim().split(/\s+/)).map(([k, ...v]) => [k!.toLowerCase(), v]));

describe("the page's content security policy and item pictures", () => {
  it('lets images come only from the app itself and data: URLs: no outside host, no scheme-wide source', () => {
    expect(directives.get('img-src')).toEqual(["'self'", 'data:']);
    expect(directives.get('default-src')).toEqual(["'self'"]);
    expect(directives.get('connect-src')).toEqual(["'self'"]);
  });

  it('lets the api hand the page only data: thumbnails, never an address to fetch', () => {
    expect(PictureDataUrl.safeParse('data:image/webp;base64,UklGRg==').success).toBe(true);
    for (const bad of ['https://pictures.example/a.jpg', '//pictures.example/a.jpg', 'blob:http://127.0.0.1/x', 'data:image/svg+xml;base64,PHN2Zz4=', 'data:text/html,<script>', 'data:image/webp;base64,AA" onerror="x']) {
      expect(PictureDataUrl.safeParse(bad).success, bad).toBe(false);
    }
  });
});
