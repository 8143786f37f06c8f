import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { findElectronBinary } from '../launch/electron.ts';

/**
 * What `npm run dist` builds on this machine (scripts/dist.ts runs it). The web shell (the renderer in
 * dist/renderer, the command line and loopback server in dist-node/) builds anywhere. The desktop packages
 * electron-builder.yml lists for this platform need Electron's own binary, which some machines cannot
 * download (notes/toolchain.md): where it is missing, `dist` builds the web shell, says plainly that the
 * desktop packages were not built and why, and exits 0; with `--desktop` (a release machine that must
 * produce them) it exits 1 instead.
 */
export interface DistPlan {
  /** electron-builder's platform flag for this machine, or null on a platform it has no target for here. */
  platform: '--linux' | '--win' | '--mac' | null;
  /** The Electron binary found, or null. */
  electron: string | null;
  /** electron-builder's arguments when the desktop packages can be built: the local Electron, never a download of it. */
  builderArgs: string[] | null;
  /** The targets electron-builder.yml names for this platform. */
  targets: string[];
  /** Said at the end, in words. */
  desktopNote: string;
}

const PLATFORM: Record<string, { flag: '--linux' | '--win' | '--mac'; key: 'linux' | 'win' | 'mac' }> = {
  linux: { flag: '--linux', key: 'linux' },
  win32: { flag: '--win', key: 'win' },
  darwin: { flag: '--mac', key: 'mac' },
};

export function planDist(root: string, platform: string = process.platform): DistPlan {
  const p = PLATFORM[platform];
  const config = readBuilderConfig(root);
  const targets = p ? (config[p.key]?.target ?? []) : [];
  const electron = findElectronBinary(root);
  if (!p) return { platform: null, electron, builderArgs: null, targets, desktopNote: `desktop packages: not built (electron-builder.yml has no target for ${platform})` };
  if (!electron) {
    return {
      platform: p.flag,
      electron,
      builderArgs: null,
      targets,
      desktopNote:
        `desktop packages (${targets.join(', ')}): NOT built — Electron's binary is not installed here (node_modules/electron has no dist/ ` +
        "with the file its path.txt names; its download could not be made on this machine). On a machine that can download it, run " +
        '`node node_modules/electron/install.js` and then `npm run dist` again. The web shell above is complete: `npm start` serves it.',
    };
  }
  const electronDir = path.dirname(createRequire(path.join(root, 'noop.js')).resolve('electron/package.json'));
  const version = (JSON.parse(fs.readFileSync(path.join(electronDir, 'package.json'), 'utf8')) as { version: string }).version;
  return {
    platform: p.flag,
    electron,
    builderArgs: [p.flag, `-c.electronDist=${path.join(electronDir, 'dist')}`, `-c.electronVersion=${version}`],
    targets,
    desktopNote: `desktop packages (${targets.join(', ')}): built into release/ with the local Electron ${version}`,
  };
}

/** electron-builder.yml is JSON-compatible YAML with # comments first (test/shell/packaging.test.ts reads it so too). */
function readBuilderConfig(root: string): Partial<Record<'linux' | 'win' | 'mac', { target?: string[] }>> {
  const text = fs.readFileSync(path.join(root, 'electron-builder.yml'), 'utf8');
  return JSON.parse(text.split('\n').filter((l) => !l.trimStart().startsWith('#')).join('\n')) as Partial<Record<'linux' | 'win' | 'mac', { target?: string[] }>>;
}
