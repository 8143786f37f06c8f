import { spawn } from 'node:child_process';

/**
 * A browser that ends this soon after it was started never showed a window the editor could have closed:
 * Chromium with no display (or refusing to run as root without its sandbox) exits within a second. Common
 * practice, no source: a person needs longer than this to see a window and close it.
 */
export const OPENED_AT_ONCE_MS = 5_000;

export interface AppWindowOptions {
  browser: string;
  args: readonly string[];
  /** Said once when no window could be opened; the web shell keeps serving. */
  say(line: string): void;
  /** The window the editor saw was closed: the session ends. */
  onClosed(): void;
  /** Always called when the browser process is gone (the throw-away profile is removed then). */
  onGone(): void;
  /** Clock, swappable for tests. */
  now?: () => number;
  atOnceMs?: number;
}

/** Keeps the last few hundred characters of the browser's error output, for the reason it gives. */
function lastLine(text: string): string {
  const lines = text
    .split('\n')
    .map((l) => l.replace(/^\[[^\]]*\]\s*/, '').trim())
    .filter((l) => l !== '');
  return lines.at(-1) ?? '';
}

/**
 * Starts the browser on the app's page. A failed start, a failing exit or an exit at once means no window
 * could be opened: say so plainly and keep serving (the address was printed before). Only a window that ran
 * and then ended cleanly ends the session.
 */
export function openAppWindow(o: AppWindowOptions): void {
  const now = o.now ?? Date.now;
  const atOnceMs = o.atOnceMs ?? OPENED_AT_ONCE_MS;
  const startedAt = now();
  let errors = '';
  let done = false;
  const child = spawn(o.browser, o.args, { stdio: ['ignore', 'ignore', 'pipe'] });
  child.stderr.on('data', (c: Buffer) => {
    errors = (errors + c.toString('utf8')).slice(-2000);
  });
  const noWindow = (why: string) =>
    o.say(`No window could be opened (${o.browser} ${why}). Shelfwright keeps running: open the address above in a browser; Ctrl+C stops it.`);
  child.on('error', (e) => {
    if (done) return;
    done = true;
    noWindow(`could not start: ${e.message}`);
    o.onGone();
  });
  child.on('close', (code, signal) => {
    if (done) return;
    done = true;
    o.onGone();
    const atOnce = now() - startedAt < atOnceMs;
    if (code === 0 && !atOnce) {
      o.onClosed();
      return;
    }
    const reason = lastLine(errors);
    const how = signal ? `was stopped by ${signal}` : atOnce ? `exited at once with code ${code ?? '?'}` : `exited with code ${code ?? '?'}`;
    noWindow(reason ? `${how}: ${reason}` : how);
  });
}
