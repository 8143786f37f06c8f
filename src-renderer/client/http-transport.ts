import type { ApiResult } from '../../src-main/api/define.ts';
import { ApiCallError, type StagedUpload, type Transport, type Uploader } from './client.ts';

/** Same header name as the web shell's guard (src-main/shell/web/guard.ts); the renderer may not import shell code. */
const TOKEN_HEADER = 'x-shelfwright-token';

/** Where a reload finds the token again (see readLaunchToken). */
export const TOKEN_STORAGE_KEY = 'shelfwright-token';

/**
 * The launch token, from the `#token=` fragment of the address the launcher printed and opened. The server
 * never hands it out (any local account can fetch the page), and a fragment is never sent in a request, so
 * the token travels only from the launcher to this page. The fragment is then removed from the address bar
 * (and from history), so it is not shown, bookmarked or copied along with the address.
 *
 * It is kept in sessionStorage, not only in memory, so that a reload (F5) keeps working. We judge that
 * acceptable: sessionStorage belongs to this origin and this one window, is dropped when the window closes,
 * and lives in the browser profile of the account that launched us (the launcher's throw-away profile is a
 * 0700 folder removed on exit); anything that could read it there could read the launcher's own output too.
 * Script injected into the page could read it, but such script could call the api from the page anyway,
 * and the CSP admits no script but our own. A fragment given again always wins over a stored token (a new
 * launch on a port used before).
 */
export function readLaunchToken(loc: Location, hist: History | null, storage: Storage | null): string | null {
  const fromFragment = new URLSearchParams(loc.hash.replace(/^#/, '')).get('token');
  if (fromFragment) {
    hist?.replaceState(null, '', loc.pathname + loc.search);
    try {
      storage?.setItem(TOKEN_STORAGE_KEY, fromFragment);
    } catch {
      // Storage refused (private mode, quota): the token still works until the page is reloaded.
    }
    return fromFragment;
  }
  try {
    return storage?.getItem(TOKEN_STORAGE_KEY) || null;
  } catch {
    return null;
  }
}

/**
 * What a 401 means to the person at the window: the key it holds is not this run's (Shelfwright was restarted,
 * or the address was opened without its `#token=` part), so the fix is the address the launcher printed.
 */
export const WRONG_KEY_MESSAGE =
  'Shelfwright does not recognise this window (it may have been restarted). Open the address it printed when it started, including the part after #.';

export function createHttpTransport(token: string, fetchImpl: typeof fetch = fetch, base = ''): Transport {
  return async (method, payload) => {
    const res = await fetchImpl(`${base}/api/${encodeURIComponent(method)}`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', [TOKEN_HEADER]: token },
      body: JSON.stringify(payload ?? {}),
    });
    if (res.status === 401) return { ok: false, error: { code: 'input', message: WRONG_KEY_MESSAGE } };
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
    if (res.status === 401) throw new ApiCallError({ code: 'input', message: WRONG_KEY_MESSAGE });
    const type = res.headers.get('content-type') ?? '';
    if (!type.includes('application/json')) throw new Error(`HTTP ${res.status}`);
    const result = (await res.json()) as ApiResult<StagedUpload>;
    if (!result.ok) throw new ApiCallError(result.error);
    return result.value;
  };
}
