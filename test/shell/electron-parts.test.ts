import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { MenuItemConstructorOptions } from 'electron';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildMenuTemplate, type MenuActions } from '../../src-main/shell/electron/menu.ts';
import { electronNativeBinding } from '../../src-main/shell/electron/native-binding.ts';
import { loadRecent, rememberRecent } from '../../src-main/shell/electron/recent.ts';
import { DEFAULT_WINDOW, loadWindowState, saveWindowState } from '../../src-main/shell/electron/window-state.ts';

let dir: string;
beforeEach(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-electron-'));
});
afterEach(() => fs.rmSync(dir, { recursive: true, force: true }));

function flatten(items: MenuItemConstructorOptions[]): MenuItemConstructorOptions[] {
  return items.flatMap((i) => [i, ...(Array.isArray(i.submenu) ? flatten(i.submenu) : [])]);
}

describe('window state', () => {
  it('remembers the size and position it was given', () => {
    const file = path.join(dir, 'nested', 'window.json');
    saveWindowState(file, { width: 1400, height: 900, x: 10, y: 20, maximized: true });
    expect(loadWindowState(file)).toEqual({ width: 1400, height: 900, x: 10, y: 20, maximized: true });
    expect(fs.existsSync(`${file}.tmp`)).toBe(false);
  });
  it('falls back to 1280×800 on a missing or broken file, and clamps a too-small window', () => {
    expect(loadWindowState(path.join(dir, 'none.json'))).toEqual(DEFAULT_WINDOW);
    fs.writeFileSync(path.join(dir, 'bad.json'), '{"width": "wide"');
    expect(loadWindowState(path.join(dir, 'bad.json'))).toEqual({ width: 1280, height: 800, maximized: false });
    fs.writeFileSync(path.join(dir, 'tiny.json'), JSON.stringify({ width: 50, height: 50 }));
    expect(loadWindowState(path.join(dir, 'tiny.json'))).toEqual({ width: 960, height: 640, maximized: false });
  });
});

describe('recent workspaces', () => {
  it('keeps the newest first, without duplicates, at most eight', () => {
    const file = path.join(dir, 'recent.json');
    for (let i = 0; i < 10; i++) rememberRecent(file, `/w/${i}.sqlite`);
    rememberRecent(file, '/w/3.sqlite');
    const list = loadRecent(file);
    expect(list).toHaveLength(8);
    expect(list[0]).toBe('/w/3.sqlite');
    expect(list.filter((f) => f === '/w/3.sqlite')).toHaveLength(1);
  });
});

describe('menu template', () => {
  const calls: string[] = [];
  const actions: MenuActions = {
    newWorkspace: () => calls.push('new'),
    openWorkspace: () => calls.push('open'),
    openRecent: (f) => calls.push(`recent:${f}`),
    command: (c) => calls.push(`cmd:${c}`),
  };

  it('uses Cmd on macOS with Shift+Cmd+Z to redo, and Ctrl+Y elsewhere', () => {
    const mac = flatten(buildMenuTemplate('darwin', [], actions));
    const linux = flatten(buildMenuTemplate('linux', [], actions));
    expect(mac.find((i) => i.label === 'Redo')?.accelerator).toBe('Shift+Cmd+Z');
    expect(linux.find((i) => i.label === 'Redo')?.accelerator).toBe('Ctrl+Y');
    expect(mac[0]?.role).toBe('appMenu');
    expect(linux.some((i) => i.role === 'quit')).toBe(true);
    expect(mac.some((i) => i.role === 'quit')).toBe(false);
  });

  it('wires workspace, recent, import, export, undo and redo to their actions', () => {
    calls.length = 0;
    const items = flatten(buildMenuTemplate('linux', ['/a.sqlite'], actions));
    for (const label of ['New Workspace…', 'Open Workspace…', '/a.sqlite', 'Import Data…', 'Export…', 'Undo', 'Redo']) {
      const item = items.find((i) => i.label === label);
      expect(item, label).toBeDefined();
      (item?.click as () => void)();
    }
    expect(calls).toEqual(['new', 'open', 'recent:/a.sqlite', 'cmd:import', 'cmd:export', 'cmd:undo', 'cmd:redo']);
  });

  it('shows a disabled line when there is nothing recent', () => {
    const items = flatten(buildMenuTemplate('win32', [], actions));
    expect(items.find((i) => i.label === 'No recent workspaces')?.enabled).toBe(false);
  });
});

describe('electronNativeBinding', () => {
  it('is null when the Electron build was never made', () => {
    expect(electronNativeBinding(dir)).toBeNull();
  });
  it('prefers the unpacked copy inside a packaged app', () => {
    const packed = path.join(dir, 'resources', 'app.asar');
    const unpacked = path.join(dir, 'resources', 'app.asar.unpacked', 'build', 'electron');
    fs.mkdirSync(unpacked, { recursive: true });
    fs.writeFileSync(path.join(unpacked, 'better_sqlite3.node'), '');
    expect(electronNativeBinding(packed)).toBe(path.join(unpacked, 'better_sqlite3.node'));
  });
});
