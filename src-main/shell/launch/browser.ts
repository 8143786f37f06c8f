import fs from 'node:fs';
import path from 'node:path';

/** Names tried in order; the first executable found on PATH wins. */
export const BROWSER_NAMES = ['chromium', 'chromium-browser', 'google-chrome', 'google-chrome-stable'] as const;

/** The first Chromium-family browser on `pathEnv`, or null. `isExecutable` is swappable for tests. */
export function findChromium(pathEnv: string | undefined, isExecutable: (file: string) => boolean = canExecute): string | null {
  const dirs = (pathEnv ?? '').split(path.delimiter).filter((d) => d !== '');
  for (const name of BROWSER_NAMES) {
    for (const dir of dirs) {
      const file = path.join(dir, name);
      if (isExecutable(file)) return file;
    }
  }
  return null;
}

function canExecute(file: string): boolean {
  try {
    fs.accessSync(file, fs.constants.X_OK);
    return fs.statSync(file).isFile();
  } catch {
    return false;
  }
}

/**
 * App mode (one window, no tabs or address bar) with a throw-away profile, so the editor's own browser
 * profile is never touched, and no background traffic: the tool works offline and sends nothing.
 */
export function chromiumAppArgs(url: string, userDataDir: string): string[] {
  return [
    `--app=${url}`,
    `--user-data-dir=${userDataDir}`,
    '--no-first-run',
    '--no-default-browser-check',
    '--disable-background-networking',
    '--disable-component-update',
    '--disable-sync',
    '--window-size=1280,800',
  ];
}
