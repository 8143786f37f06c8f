import { spawn } from 'node:child_process';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

describe('the command as a process', () => {
  it('stops quietly with exit 0 when its reader has closed the pipe (shelfwright --help | head -c 0)', async () => {
    const bin = path.resolve(import.meta.dirname, '../../bin/shelfwright.js');
    const child = spawn(process.execPath, [bin, '--help'], { stdio: ['ignore', 'pipe', 'pipe'] });
    child.stdout.destroy(); // the reader is gone before the first line is written
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    const code = await new Promise<number | null>((resolve) => child.on('close', (c) => resolve(c)));
    expect(stderr).toBe('');
    expect(code).toBe(0);
  }, 30_000);
});
