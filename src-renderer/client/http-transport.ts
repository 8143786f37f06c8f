import type { ApiResult } from '../../src-main/api/define.ts';
import { ApiCallError, type StagedUpload, type Transport, type Uploader } from './client.ts';

/** Same header name as the web shell's guard (src-main/shell/web/guard.ts); the renderer may not import shell code. */
const TOKEN_HEADER = 'x-shelfwright-token';

/**
 * The launch token: from the meta tag the web shell injects into index.html, else from the `#token=`
 * fragment of the address the shell printed. The fragment is then removed from the address bar.
 */
export function readLaunchToken(doc: Document, loc: Location, hist: History | null): string | null {
  const meta = doc.querySelector<HTMLMetaElement>('meta[name="shelfwright-token"]');
  const fromFragment = new URLSearchParams(loc.hash.replace(/^#/, '')).get('token');
  if (fromFragment && hist) hist.replaceState(null, '', loc.pathname + loc.search);
  return meta?.content || fromFragment || null;
}

export function createHttpTransport(token: string, fetchImpl: typeof fetch = fetch, base = ''): Transport {
  return async (method, payload) => {
    const res = await fetchImpl(`${base}/api/${encodeURIComponent(method)}`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', [TOKEN_HEADER]: token },
      body: JSON.stringify(payload ?? {}),
    });
    const type = res.headers.get('content-type') ?? '';
    if (!type.includes('application/json')) throw new Error(`HTTP ${res.status}`);
    return (await res.json()) as ApiResult<unknown>;
  };
}

/**
 * Sends a file as a stream to the web shell's POST /upload (the body is the File itself, which the browser
 * streams from disk), for files too big to send inside an api call. Answers the id the import calls take.
 */
export function createHttpUploader(token: string, fetchImpl: typeof fetch = fetch, base = ''): Uploader {
  return async (file) => {
    const res = await fetchImpl(`${base}/upload`, {
      method: 'POST',
      headers: { 'content-type': 'application/octet-stream', 'x-file-name': encodeURIComponent(file.name), [TOKEN_HEADER]: token },
      body: file,
    });
    const type = res.headers.get('content-type') ?? '';
    if (!type.includes('application/json')) throw new Error(`HTTP ${res.status}`);
    const result = (await res.json()) as ApiResult<StagedUpload>;
    if (!result.ok) throw new ApiCallError(result.error);
    return result.value;
  };
}
