import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { planDist } from '../../src-main/shell/packaging/dist-plan.ts';

/** A project folder with the real electron-builder.yml and, optionally, an installed Electron. */
const roots: string[] = [];
function project(electron: 'none' | 'package-only' | 'binary'): string {
  const root = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-dist-'));
  roots.push(root);
  fs.copyFileSync(path.resolve(import.meta.dirname, '../../electron-builder.yml'), path.join(root, 'electron-builder.yml'));
  if (electron !== 'none') {
    const dir = path.join(root, 'node_modules', 'electron');
    fs.mkdirSync(dir, { recursive: true });
    fs.writeFileSync(path.join(dir, 'package.json'), JSON.stringify({ name: 'electron', version: '45.5.0' }));
    if (electron === 'binary') {
      fs.writeFileSync(path.join(dir, 'path.txt'), 'electron');
      fs.mkdirSync(path.join(dir, 'dist'));
      fs.writeFileSync(path.join(dir, 'dist', 'electron'), '');
    }
  }
  return root;
}
afterAll(() => roots.forEach((r) => fs.rmSync(r, { recursive: true, force: true })));

describe('npm run dist decides what it can build', () => {
  it('builds the web shell and says plainly why the desktop packages were not built without Electron\'s binary', () => {
    for (const kind of ['none', 'package-only'] as const) {
      const plan = planDist(project(kind), 'linux');
      expect(plan.builderArgs).toBeNull();
      expect(plan.targets).toEqual(['AppImage', 'deb']);
      expect(plan.desktopNote).toMatch(/^desktop packages \(AppImage, deb\): NOT built — Electron's binary is not installed here/);
      expect(plan.desktopNote).toContain('node node_modules/electron/install.js');
    }
  });

  it('packages with the local Electron (no download of it) where its binary is installed', () => {
    const root = project('binary');
    const plan = planDist(root, 'linux');
    expect(plan.builderArgs).toEqual(['--linux', `-c.electronDist=${path.join(root, 'node_modules', 'electron', 'dist')}`, '-c.electronVersion=45.5.0']);
    expect(planDist(root, 'win32').targets).toEqual(['nsis']);
    expect(planDist(root, 'darwin').targets).toEqual(['dmg']);
  });
});
