import type { MenuItemConstructorOptions } from 'electron';
import type { MenuCommand } from './channel.ts';

export interface MenuActions {
  newWorkspace(): void;
  openWorkspace(): void;
  openRecent(file: string): void;
  command(c: MenuCommand): void;
}

/**
 * The native menu as a plain template, so it can be tested without Electron. Shortcuts follow each
 * platform's convention: Cmd on macOS, Ctrl elsewhere; redo is Shift+Cmd+Z on macOS and Ctrl+Y on Windows
 * and Linux (Apple Human Interface Guidelines, "Keyboard shortcuts"; Microsoft "Keyboard shortcuts in apps").
 * Undo and redo in the Edit menu act on the editor's last action; inside a text field the field's own
 * undo still runs, because the page handles the command (src-renderer/App.tsx).
 */
export function buildMenuTemplate(platform: NodeJS.Platform, recent: readonly string[], actions: MenuActions): MenuItemConstructorOptions[] {
  const mac = platform === 'darwin';
  const recentItems: MenuItemConstructorOptions[] =
    recent.length === 0
      ? [{ label: 'No recent workspaces', enabled: false }]
      : recent.map((file) => ({ label: file, click: () => actions.openRecent(file) }));
  const template: MenuItemConstructorOptions[] = [
    {
      label: mac ? 'File' : '&File',
      submenu: [
        { label: 'New Workspace…', accelerator: 'CmdOrCtrl+N', click: () => actions.newWorkspace() },
        { label: 'Open Workspace…', accelerator: 'CmdOrCtrl+O', click: () => actions.openWorkspace() },
        { label: 'Open Recent', submenu: recentItems },
        { type: 'separator' },
        { label: 'Import Data…', accelerator: 'CmdOrCtrl+I', click: () => actions.command('import') },
        { label: 'Export…', accelerator: 'CmdOrCtrl+E', click: () => actions.command('export') },
        ...(mac ? [] : ([{ type: 'separator' }, { role: 'quit' }] as MenuItemConstructorOptions[])),
      ],
    },
    {
      label: mac ? 'Edit' : '&Edit',
      submenu: [
        { label: 'Undo', accelerator: 'CmdOrCtrl+Z', click: () => actions.command('undo') },
        { label: 'Redo', accelerator: mac ? 'Shift+Cmd+Z' : 'Ctrl+Y', click: () => actions.command('redo') },
        { type: 'separator' },
        { role: 'cut' },
        { role: 'copy' },
        { role: 'paste' },
        { role: 'selectAll' },
      ],
    },
    {
      label: mac ? 'View' : '&View',
      submenu: [
        { label: 'Overview', accelerator: 'CmdOrCtrl+1', click: () => actions.command('overview') },
        { type: 'separator' },
        { role: 'resetZoom' },
        { role: 'zoomIn' },
        { role: 'zoomOut' },
        { type: 'separator' },
        { role: 'togglefullscreen' },
      ],
    },
    { role: 'windowMenu' },
  ];
  return mac ? [{ role: 'appMenu' }, ...template] : template;
}
