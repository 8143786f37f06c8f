import fs from 'node:fs';
import type { Protocol } from 'electron';
import { CONTENT_SECURITY_POLICY } from '../web/guard.ts';
import { contentTypeOf, resolveStaticFile } from '../web/static.ts';
import { APP_SCHEME } from './channel.ts';

/** Must run before app 'ready' (Electron docs, protocol.registerSchemesAsPrivileged). */
export function registerAppScheme(protocol: Protocol): void {
  protocol.registerSchemesAsPrivileged([
    { scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true } },
  ]);
}

/**
 * Serves the built renderer on app://shelfwright/ with the same CSP and headers as the web shell, and
 * the same traversal checks (a file:// page would get neither a CSP header nor an origin to check).
 */
export function serveRenderer(protocol: Protocol, rendererDir: string): void {
  protocol.handle(APP_SCHEME, (request) => {
    const url = new URL(request.url);
    const wanted = url.pathname === '/' ? '/index.html' : url.pathname;
    const file = url.host === 'shelfwright' ? resolveStaticFile(rendererDir, wanted) : null;
    if (!file) return new Response('not found', { status: 404 });
    return new Response(fs.readFileSync(file), {
      status: 200,
      headers: {
        'content-type': contentTypeOf(file),
        'content-security-policy': CONTENT_SECURITY_POLICY,
        'x-content-type-options': 'nosniff',
        'referrer-policy': 'no-referrer',
      },
    });
  });
}
