import fs from 'node:fs';
import path from 'node:path';

/** Content types for what vite emits; anything else is served as bytes (and nosniff keeps it so). */
const CONTENT_TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.jpg': 'image/jpeg',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.txt': 'text/plain; charset=utf-8',
};

export function contentTypeOf(file: string): string {
  return CONTENT_TYPES[path.extname(file).toLowerCase()] ?? 'application/octet-stream';
}

/**
 * Maps a URL path onto a file inside `root`, or null when it would leave root, names a directory or does
 * not exist. Decoding happens once, before the check, so `%2e%2e/` cannot slip past; NUL bytes and
 * backslashes are refused outright (a Windows path separator inside a URL is never legitimate here).
 */
export function resolveStaticFile(root: string, urlPath: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath);
  } catch {
    return null;
  }
  if (decoded.includes('\0') || decoded.includes('\\')) return null;
  const rootAbs = path.resolve(root);
  const target = path.resolve(rootAbs, '.' + path.posix.normalize('/' + decoded));
  if (target !== rootAbs && !target.startsWith(rootAbs + path.sep)) return null;
  let real: string;
  try {
    real = fs.realpathSync(target);
  } catch {
    return null;
  }
  // A symlink inside root that points outside it is refused too.
  const rootReal = fs.realpathSync(rootAbs);
  if (!real.startsWith(rootReal + path.sep)) return null;
  if (!fs.statSync(real).isFile()) return null;
  return real;
}
