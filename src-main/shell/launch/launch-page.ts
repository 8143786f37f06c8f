import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

/** The file name of the forwarding page inside the browser's private profile folder. */
export const LAUNCH_PAGE_NAME = 'open-shelfwright.html';

/**
 * Writes a one-line page that forwards the browser to `pageUrl` (the app's address with `#token=`), and
 * answers its file:// address, which is what the browser is started with.
 *
 * Why not start the browser with `pageUrl` itself: a process's command line is readable by every account on
 * the machine (/proc/<pid>/cmdline, `ps -ef`), so the token would be handed to anyone who looks. The file is
 * created 0600 (and only new: `wx`) inside `privateDir`, which must be a folder only this account can enter
 * (mkdtemp makes it 0700): other accounts can read neither the folder nor the file.
 */
export function writeLaunchPage(privateDir: string, pageUrl: string): string {
  const mode = fs.statSync(privateDir).mode & 0o777;
  if (mode & 0o077) throw new Error(`refusing to write the launch page into ${privateDir}: other accounts can enter it (mode ${mode.toString(8)})`);
  const file = path.join(privateDir, LAUNCH_PAGE_NAME);
  // The address is our own (digits, hex and fixed text), but it is escaped for the attribute all the same.
  const target = pageUrl.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;');
  const html = `<!doctype html><html><head><meta charset="utf-8"><title>Shelfwright</title><meta http-equiv="refresh" content="0; url=${target}"></head><body></body></html>\n`;
  fs.writeFileSync(file, html, { mode: 0o600, flag: 'wx' });
  return pathToFileURL(file).href;
}
