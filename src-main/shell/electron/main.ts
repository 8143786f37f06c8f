/**
 * Electron's main process: one window over the same handler table as the web shell (DESIGN.md, Shells).
 * Bundled to dist-electron/main.cjs by vite.electron.config.ts; start.ts runs it only when Electron's
 * binary is installed. better-sqlite3 is loaded with the Electron-ABI build (native-binding.ts).
 */
import path from 'node:path';
import { app, dialog, ipcMain, Menu, protocol, type BrowserWindow } from 'electron';
import { createHandlerTable, invoke } from '../../api/handler-table.ts';
import { AppContext } from '../../services/context.ts';
import { sweepTempFolders } from '../../services/temp-folders.ts';
import { APP_BLOCKING_WAIT_MS } from '../../store/workspace.ts';
import { APP_ORIGIN, INVOKE_CHANNEL, MENU_EVENT, type MenuCommand } from './channel.ts';
import { buildMenuTemplate } from './menu.ts';
import { electronNativeBinding } from './native-binding.ts';
import { registerAppScheme, serveRenderer } from './protocol.ts';
import { loadRecent, rememberRecent } from './recent.ts';
import { createMainWindow, preloadPath } from './window.ts';

const appRoot = path.resolve(__dirname, '..');
const rendererDir = path.join(appRoot, 'dist', 'renderer');

function workspaceArg(argv: readonly string[]): string | null {
  const i = argv.indexOf('--workspace');
  return i >= 0 ? (argv[i + 1] ?? null) : null;
}

registerAppScheme(protocol);

if (!app.requestSingleInstanceLock()) {
  // A second launch hands over to the first window and quits (Electron docs, app.requestSingleInstanceLock).
  app.quit();
} else {
  const binding = electronNativeBinding(appRoot);
  // A synchronous write waiting for another process blocks the window's every request: kept short here.
  const ctx = new AppContext({ blockingWaitMs: APP_BLOCKING_WAIT_MS, ...(binding && { nativeBinding: binding }) });
  const table = createHandlerTable(ctx);
  const recentFile = () => path.join(app.getPath('userData'), 'recent.json');
  let win: BrowserWindow | null = null;

  const sendCommand = (c: MenuCommand) => {
    // The page listens for a DOM event; nothing is added to the preload bridge for menus.
    void win?.webContents.executeJavaScript(`window.dispatchEvent(new CustomEvent(${JSON.stringify(MENU_EVENT)}, { detail: ${JSON.stringify(c)} }))`);
  };

  const openFile = (file: string, create: boolean) => {
    try {
      ctx.open(file, { create });
      rememberRecent(recentFile(), file);
      refreshMenu();
      win?.webContents.reload();
    } catch (e) {
      dialog.showErrorBox('Could not open the workspace', `${(e as Error).message}\n\nChoose another file, or create a new workspace.`);
    }
  };

  const refreshMenu = () => {
    const template = buildMenuTemplate(process.platform, loadRecent(recentFile()), {
      newWorkspace: async () => {
        const r = await dialog.showSaveDialog({ title: 'New workspace', filters: [{ name: 'Workspace', extensions: ['sqlite'] }] });
        if (!r.canceled && r.filePath) openFile(r.filePath, true);
      },
      openWorkspace: async () => {
        const r = await dialog.showOpenDialog({ title: 'Open workspace', properties: ['openFile'], filters: [{ name: 'Workspace', extensions: ['sqlite'] }] });
        const file = r.filePaths[0];
        if (!r.canceled && file) openFile(file, false);
      },
      openRecent: (file) => openFile(file, false),
      command: sendCommand,
    });
    Menu.setApplicationMenu(Menu.buildFromTemplate(template));
  };

  app.on('second-instance', () => {
    if (win?.isMinimized()) win.restore();
    win?.focus();
  });

  app.whenReady().then(() => {
    sweepTempFolders(); // what a killed earlier run left behind (services/temp-folders.ts)
    serveRenderer(protocol, rendererDir);
    ipcMain.handle(INVOKE_CHANNEL, (event, method: unknown, payload: unknown) => {
      // Only our own page may call the api (Electron security checklist: validate the sender of every IPC message).
      if (!event.senderFrame || !event.senderFrame.url.startsWith(`${APP_ORIGIN}/`)) {
        return { ok: false, error: { code: 'input', message: 'calls are accepted only from the Shelfwright window' } };
      }
      // Paths are taken here (api/path-fields.ts): no other account can reach this window's IPC, and the
      // person at it names their own files, as at the command line.
      return invoke(table, typeof method === 'string' ? method : '', payload, { serverPaths: 'allow' });
    });
    const workspace = workspaceArg(process.argv);
    if (workspace) {
      try {
        ctx.open(workspace, { create: true });
        rememberRecent(recentFile(), workspace);
      } catch (e) {
        dialog.showErrorBox('Could not open the workspace', (e as Error).message);
      }
    }
    refreshMenu();
    win = createMainWindow(preloadPath(__dirname), path.join(app.getPath('userData'), 'window.json'));
    win.on('closed', () => {
      win = null;
    });
  });

  app.on('window-all-closed', () => {
    ctx.close();
    app.quit();
  });
}
