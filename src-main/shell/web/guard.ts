import { timingSafeEqual } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';

/**
 * The header every api and upload request must carry. The page gets the value from the `#token=` fragment of
 * the address the launcher opened (never from the server: it serves no secret to anyone).
 */
export const TOKEN_HEADER = 'x-shelfwright-token';

/**
 * The page may load only its own files and talk only to its own origin. Styles set through the CSSOM
 * (React's style prop, uPlot) are not affected by style-src, so no 'unsafe-inline' is needed. Images: the
 * app's own files and `data:` (item thumbnails arrive through the api as data: URLs, api/contracts/pictures.ts),
 * never an outside address; no `blob:`, which nothing draws.
 */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

/** Headers sent with every response, api or file (OWASP Secure Headers Project recommendations). */
export function setSecurityHeaders(res: ServerResponse): void {
  res.setHeader('Content-Security-Policy', CONTENT_SECURITY_POLICY);
  res.setHeader('X-Content-Type-Options', 'nosniff');
  res.setHeader('Referrer-Policy', 'no-referrer');
  res.setHeader('X-Frame-Options', 'DENY');
  res.setHeader('Cross-Origin-Opener-Policy', 'same-origin');
  res.setHeader('Cross-Origin-Resource-Policy', 'same-origin');
}

/**
 * DNS-rebinding defence: a hostile page that re-points its own name at 127.0.0.1 still sends its own name
 * in Host, so only the two loopback spellings with our exact port are accepted.
 */
export function hostIsAllowed(host: string | undefined, port: number): boolean {
  return host === `127.0.0.1:${port}` || host === `localhost:${port}`;
}

/** A browser sends Origin on cross-origin POSTs; when present it must be our own origin. */
export function originIsAllowed(origin: string | undefined, port: number): boolean {
  if (origin === undefined) return true;
  return origin === `http://127.0.0.1:${port}` || origin === `http://localhost:${port}`;
}

/** Constant-time comparison so the token cannot be guessed byte by byte from response times. */
export function tokenMatches(given: string | string[] | undefined, expected: string): boolean {
  if (typeof given !== 'string') return false;
  const a = Buffer.from(given, 'utf8');
  const b = Buffer.from(expected, 'utf8');
  return a.length === b.length && timingSafeEqual(a, b);
}

export function requestToken(req: IncomingMessage): string | string[] | undefined {
  return req.headers[TOKEN_HEADER];
}
