import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { electronNativeBinding } from '../../src-main/shell/electron/native-binding.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');

interface BuilderConfig {
  appId: string;
  productName: string;
  extraMetadata: { main: string };
  files: string[];
  asarUnpack: string[];
  linux: { target: string[] };
  win: { target: string[] };
  mac: { target: string[] };
}

/** electron-builder.yml is JSON-compatible YAML (YAML 1.2 is a superset of JSON); only # comments precede it. */
function readBuilderConfig(): BuilderConfig {
  const text = fs.readFileSync(path.join(ROOT, 'electron-builder.yml'), 'utf8');
  const body = text
    .split('\n')
    .filter((l) => !l.trimStart().startsWith('#'))
    .join('\n');
  return JSON.parse(body) as BuilderConfig;
}

function buildElectronBundles(): void {
  const vite = path.join(ROOT, 'node_modules/vite/bin/vite.js');
  const config = path.join(ROOT, 'src-main/shell/electron/vite.electron.config.ts');
  for (const mode of ['main', 'preload', 'workers']) {
    const r = spawnSync(process.execPath, [vite, 'build', '--config', config, '--mode', mode, '--logLevel', 'error'], { cwd: ROOT, encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`vite build --mode ${mode} failed: ${r.stderr}`);
  }
}

describe('electron-builder.yml', () => {
  const config = readBuilderConfig();

  beforeAll(() => buildElectronBundles(), 60_000);

  it('names the product and the installers for every desktop platform', () => {
    expect(config.productName).toBe('Shelfwright');
    expect(config.appId).toMatch(/^[a-z0-9.]+$/);
    expect(config.linux.target).toEqual(['AppImage', 'deb']);
    expect(config.win.target).toEqual(['nsis']);
    expect(config.mac.target).toEqual(['dmg']);
  });

  it('points at the same main entry as package.json, and that entry is built', () => {
    const pkg = JSON.parse(fs.readFileSync(path.join(ROOT, 'package.json'), 'utf8')) as { main: string };
    expect(config.extraMetadata.main).toBe(pkg.main);
    expect(config.files).toContain(pkg.main);
    expect(fs.existsSync(path.join(ROOT, pkg.main))).toBe(true);
  });

  it('packs every bundle the main process loads', () => {
    for (const f of config.files.filter((f) => f.startsWith('dist-electron/') && !f.includes('*'))) {
      expect(fs.existsSync(path.join(ROOT, f)), f).toBe(true);
    }
    // main.ts loads preload.cjs from its own folder and the page from dist/renderer.
    expect(config.files).toContain('dist-electron/preload.cjs');
    expect(config.files).toContain('dist/renderer/**/*');
  });

  it('packs the Electron-ABI binding where the main process looks for it, unpacked from the asar', () => {
    const listed = config.files.find((f) => f.endsWith('.node'));
    expect(listed).toBe('build/electron/better_sqlite3.node');
    expect(config.asarUnpack).toContain('**/*.node');
    const fake = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-pack-'));
    try {
      fs.mkdirSync(path.join(fake, path.dirname(listed as string)), { recursive: true });
      fs.writeFileSync(path.join(fake, listed as string), '');
      expect(electronNativeBinding(fake)).toBe(path.join(fake, listed as string));
    } finally {
      fs.rmSync(fake, { recursive: true, force: true });
    }
  });

  it('packs, beside the main bundle, every task thread the services start', () => {
    // Every siblingModule(import.meta.url, 'name') in the services must be built and listed.
    const src = path.join(ROOT, 'src-main');
    const spawned = new Set<string>();
    for (const f of fs.readdirSync(src, { recursive: true }) as string[]) {
      if (!f.endsWith('.ts')) continue;
      for (const m of fs.readFileSync(path.join(src, f), 'utf8').matchAll(/siblingModule\(import\.meta\.url, '([\w-]+)'\)/g)) spawned.add(m[1]!);
    }
    expect(spawned.size).toBeGreaterThanOrEqual(5);
    // The workers and the chunks they share are packed by one pattern.
    expect(config.files).toContain('dist-electron/*.js');
    for (const name of spawned) expect(fs.existsSync(path.join(ROOT, `dist-electron/${name}.js`)), name).toBe(true);
  });

  it('bundles the preload into one file that requires only electron (a sandboxed preload can load nothing else)', () => {
    const preload = fs.readFileSync(path.join(ROOT, 'dist-electron/preload.cjs'), 'utf8');
    const required = [...preload.matchAll(/require\((["'])([^"']+)\1\)/g)].map((m) => m[2]);
    expect(new Set(required)).toEqual(new Set(['electron']));
  });

  it('keeps better-sqlite3 out of the main bundle so the nativeBinding option can pick the ABI', () => {
    const main = fs.readFileSync(path.join(ROOT, 'dist-electron/main.cjs'), 'utf8');
    expect(main).toContain('require("better-sqlite3")');
    expect(main).not.toContain('require("bindings")');
  });
});
