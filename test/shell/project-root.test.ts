import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { projectRoot } from '../../src-main/shell/launch/project-root.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-root-'));
afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));

describe('projectRoot (where npm start finds dist/ and node_modules/)', () => {
  it('is the same folder from the source (src-main/shell/start.ts) and from the Node build (dist-node/start.js)', () => {
    expect(projectRoot(pathToFileURL(path.join(ROOT, 'src-main/shell/start.ts')).href)).toBe(ROOT);
    expect(projectRoot(pathToFileURL(path.join(ROOT, 'dist-node/start.js')).href)).toBe(ROOT);
  });

  it('is the nearest folder holding package.json, and a clear error when there is none', () => {
    fs.mkdirSync(path.join(tmp, 'a/b'), { recursive: true });
    fs.writeFileSync(path.join(tmp, 'a/package.json'), '{}');
    expect(projectRoot(pathToFileURL(path.join(tmp, 'a/b/x.js')).href)).toBe(path.join(tmp, 'a'));
    expect(() => projectRoot(pathToFileURL('/no-such-project-dir/x.js').href)).toThrow(/no package\.json above/);
  });
});
