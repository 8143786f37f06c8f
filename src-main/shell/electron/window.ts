import path from 'node:path';
import { BrowserWindow, shell as desktop } from 'electron';
import { APP_ORIGIN } from './channel.ts';
import { loadWindowState, saveWindowState } from './window-state.ts';

/**
 * The one window, hardened per Electron's security checklist (docs/tutorial/security.md): context
 * isolation, sandbox, no Node in the page, no webviews, navigation and new windows refused (links to the
 * web open in the system browser instead, and only https ones).
 */
export function createMainWindow(preload: string, stateFile: string): BrowserWindow {
  const state = loadWindowState(stateFile);
  const win = new BrowserWindow({
    width: state.width,
    height: state.height,
    ...(state.x !== undefined && state.y !== undefined ? { x: state.x, y: state.y } : {}),
    minWidth: 960,
    minHeight: 640,
    title: 'Shelfwright',
    show: false,
    backgroundColor: '#f3f5f4',
    webPreferences: {
      preload,
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
      spellcheck: false,
    },
  });
  if (state.maximized) win.maximize();
  win.once('ready-to-show', () => win.show());

  const contents = win.webContents;
  contents.on('will-navigate', (event, url) => {
    if (!url.startsWith(`${APP_ORIGIN}/`)) event.preventDefault();
  });
  contents.on('will-redirect', (event) => event.preventDefault());
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.setWindowOpenHandler(({ url }) => {
    if (url.startsWith('https://')) void desktop.openExternal(url);
    return { action: 'deny' };
  });
  contents.session.setPermissionRequestHandler((_wc, _permission, callback) => callback(false));

  const remember = () => {
    const b = win.getNormalBounds();
    saveWindowState(stateFile, { width: b.width, height: b.height, x: b.x, y: b.y, maximized: win.isMaximized() });
  };
  win.on('close', remember);
  void win.loadURL(`${APP_ORIGIN}/index.html`);
  return win;
}

export function preloadPath(mainDir: string): string {
  return path.join(mainDir, 'preload.cjs');
}
