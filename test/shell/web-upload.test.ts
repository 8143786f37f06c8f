import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHandlerTable } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { startWebShell, type WebShell } from '../../src-main/shell/web/server.ts';

interface Reply {
  status: number;
  body: string;
}

/**
 * Raw http.request. `body` is sent in chunks; without `length` it goes chunked (no Content-Length), so the
 * server cannot refuse it up front and has to count as it streams.
 */
function request(
  shell: WebShell,
  opts: { method?: string; path: string; headers?: Record<string, string>; body?: Buffer | string; length?: number; chunk?: number },
): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const headers: Record<string, string | number> = { host: `127.0.0.1:${shell.port}`, ...opts.headers };
    if (opts.length !== undefined) headers['content-length'] = opts.length;
    const req = http.request({ host: '127.0.0.1', port: shell.port, method: opts.method ?? 'POST', path: opts.path, headers }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body: Buffer.concat(chunks).toString('utf8') }));
    });
    req.on('error', reject);
    const body = typeof opts.body === 'string' ? Buffer.from(opts.body) : opts.body;
    const step = opts.chunk ?? 1024;
    if (body) for (let i = 0; i < body.length; i += step) req.write(body.subarray(i, i + step));
    req.end();
  });
}

function upload(shell: WebShell, fileName: string | null, body: Buffer | string, headers: Record<string, string> = {}, length?: number): Promise<Reply> {
  const bytes = typeof body === 'string' ? Buffer.from(body) : body;
  return request(shell, {
    path: '/upload',
    headers: {
      'x-shelfwright-token': shell.token,
      'content-type': 'application/octet-stream',
      ...(fileName !== null && { 'x-file-name': encodeURIComponent(fileName) }),
      ...headers,
    },
    body: bytes,
    length: length ?? bytes.length,
  });
}

function api(shell: WebShell, method: string, payload: unknown): Promise<Reply> {
  return request(shell, {
    path: `/api/${method}`,
    headers: { 'content-type': 'application/json', 'x-shelfwright-token': shell.token },
    body: JSON.stringify(payload),
    length: Buffer.byteLength(JSON.stringify(payload)),
  });
}

/** Every file under a folder, relative to it (empty when the folder does not exist). */
function filesUnder(dir: string | null): string[] {
  if (!dir || !fs.existsSync(dir)) return [];
  return (fs.readdirSync(dir, { recursive: true }) as string[]).filter((f) => fs.statSync(path.join(dir, f)).isFile());
}

const ITEMS = 'id,title\nb1,First book\nb2,Second book\n';
const LIMIT = 4096;

describe('web shell streamed uploads (POST /upload)', () => {
  let dir: string;
  let shell: WebShell;
  let ctx: AppContext;

  beforeAll(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-upload-'));
    const root = path.join(dir, 'renderer');
    fs.mkdirSync(root, { recursive: true });
    fs.writeFileSync(path.join(root, 'index.html'), '<!doctype html><html><head></head><body></body></html>');
    ctx = new AppContext();
    ctx.open(path.join(dir, 'w.sqlite'), { create: true });
    shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: root, maxUploadBytes: LIMIT });
  });

  afterAll(async () => {
    await shell.close();
    ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('stores the bytes, then import.preview and import.run read them by id under the original name', async () => {
    const r = await upload(shell, 'shop items (May).csv', ITEMS);
    expect(r.status).toBe(200);
    const body = JSON.parse(r.body) as { ok: true; value: { upload: string; bytes: number } };
    expect(body).toEqual({ ok: true, value: { upload: expect.stringMatching(/^[0-9a-f]{32}$/), bytes: Buffer.byteLength(ITEMS) }});
    const id = body.value.upload;
    const stored = ctx.uploads.get(id)!;
    expect(fs.readFileSync(stored.path, 'utf8')).toBe(ITEMS);
    expect(path.extname(stored.path)).toBe('.csv');
    expect(fs.statSync(ctx.uploads.folder!).mode & 0o777).toBe(0o700);

    const preview = JSON.parse((await api(shell, 'import.preview', { upload: id, target: 'items' })).body);
    expect(preview).toMatchObject({ ok: true, value: { format: 'csv', headers: ['id', 'title'] } });
    expect(fs.existsSync(stored.path)).toBe(true); // preview keeps the upload for the run

    const run = await api(shell, 'import.run', { upload: id, target: 'items' });
    expect(run.status).toBe(200);
    expect(JSON.parse(run.body)).toMatchObject({ ok: true, value: { file: 'shop items (May).csv', added: 2, committed: true } });
    expect(run.body).not.toContain(ctx.uploads.folder!);
    expect(fs.existsSync(stored.path)).toBe(false);
    expect(ctx.uploads.get(id)).toBeUndefined();

    const again = await api(shell, 'import.run', { upload: id, target: 'items' });
    expect(again.status).toBe(400);
    expect(JSON.parse(again.body).error).toMatchObject({ code: 'input', message: expect.stringMatching(/gone.*choose the file again/) });
  });

  it('removes the upload after a run that did not commit, and names rows by the original file', async () => {
    const id = JSON.parse((await upload(shell, 'bad rows.csv', 'id,title,price\nx1,X,cheap\n')).body).value.upload as string;
    const run = JSON.parse((await api(shell, 'import.run', { upload: id, target: 'items' })).body);
    expect(run.value.committed).toBe(false);
    expect(run.value.errors[0].message).toMatch(/^bad rows\.csv:2:3: /);
    expect(JSON.stringify(run)).not.toContain(ctx.uploads.folder!);
    expect(ctx.uploads.get(id)).toBeUndefined();
  });

  it('answers an unknown upload id with an input error', async () => {
    const r = await api(shell, 'import.preview', { upload: 'f'.repeat(32), target: 'items' });
    expect(r.status).toBe(400);
    expect(JSON.parse(r.body)).toEqual({ ok: false, error: { code: 'input', message: expect.stringMatching(/upload.*gone.*choose the file again/) } });
  });

  it('takes exactly one source: file, fileName with content, or upload', async () => {
    for (const bad of [
      { upload: 'a'.repeat(32), file: '/tmp/x.csv' },
      { upload: 'a'.repeat(32), fileName: 'x.csv', content: 'id\n' },
      { upload: 'A'.repeat(32) },
      { fileName: 'x.csv' },
      {},
    ]) {
      const r = await api(shell, 'import.preview', { ...bad, target: 'items' });
      expect(r.status, JSON.stringify(bad)).toBe(400);
    }
  });

  it('refuses a missing or wrong token (401) and writes nothing', async () => {
    const before = filesUnder(ctx.uploads.folder);
    const none = await upload(shell, 'a.csv', ITEMS, { 'x-shelfwright-token': '' });
    expect(none.status).toBe(401);
    const wrong = await upload(shell, 'a.csv', ITEMS, { 'x-shelfwright-token': 'a'.repeat(64) });
    expect(wrong.status).toBe(401);
    expect(JSON.parse(wrong.body)).toEqual({ ok: false, error: { code: 'input', message: expect.stringMatching(/token/) } });
    expect(filesUnder(ctx.uploads.folder)).toEqual(before);
  });

  it('refuses a foreign Origin (403) and a foreign Host (403)', async () => {
    expect((await upload(shell, 'a.csv', ITEMS, { origin: 'http://evil.example' })).status).toBe(403);
    expect((await upload(shell, 'a.csv', ITEMS, { host: 'rebound.example' })).status).toBe(403);
  });

  it('refuses a wrong method (405), content type (415) and a missing or broken file name (400)', async () => {
    const get = await request(shell, { method: 'GET', path: '/upload', headers: { 'x-shelfwright-token': shell.token } });
    expect(get.status).toBe(405);
    expect((await upload(shell, 'a.csv', ITEMS, { 'content-type': 'text/csv' })).status).toBe(415);
    const nameless = await upload(shell, null, ITEMS);
    expect(nameless.status).toBe(400);
    expect(JSON.parse(nameless.body).error.message).toMatch(/x-file-name/);
    expect((await upload(shell, null, ITEMS, { 'x-file-name': '%E0%A4%A' })).status).toBe(400);
  });

  it('refuses a file over the limit (413) and leaves nothing behind, declared or streamed', async () => {
    const before = filesUnder(ctx.uploads.folder);
    const big = Buffer.alloc(LIMIT * 4, 'x');
    const declared = await upload(shell, 'big.csv', big);
    expect(declared.status).toBe(413);
    expect(JSON.parse(declared.body)).toEqual({ ok: false, error: { code: 'input', message: expect.stringMatching(/larger than 4096 bytes/) } });
    const streamed = await request(shell, {
      path: '/upload',
      headers: { 'x-shelfwright-token': shell.token, 'content-type': 'application/octet-stream', 'x-file-name': 'big.csv' },
      body: big,
    });
    expect(streamed.status).toBe(413);
    expect(filesUnder(ctx.uploads.folder)).toEqual(before);
    // Exactly at the limit is fine.
    const edge = await upload(shell, 'edge.csv', Buffer.alloc(LIMIT, 'y'));
    expect(JSON.parse(edge.body).value.bytes).toBe(LIMIT);
    ctx.uploads.remove(JSON.parse(edge.body).value.upload as string);
  });

  it('removes the partial file when the sender breaks off', async () => {
    const before = filesUnder(ctx.uploads.folder);
    await new Promise<void>((resolve) => {
      const req = http.request({
        host: '127.0.0.1',
        port: shell.port,
        method: 'POST',
        path: '/upload',
        headers: {
          host: `127.0.0.1:${shell.port}`,
          'x-shelfwright-token': shell.token,
          'content-type': 'application/octet-stream',
          'x-file-name': 'half.csv',
          'content-length': 3000,
        },
      });
      req.on('error', () => resolve());
      req.write(Buffer.alloc(1000, 'z'));
      // Break off once the first part is on disk, so the removal is what is tested.
      const wait = setInterval(() => {
        if (filesUnder(ctx.uploads.folder).length > before.length) {
          clearInterval(wait);
          req.destroy();
        }
      }, 5);
      req.on('close', () => resolve());
    });
    await expect.poll(() => filesUnder(ctx.uploads.folder), { timeout: 2000 }).toEqual(before);
  });

  it('keeps a name like ../../evil.csv inside the private folder, under its base name', async () => {
    const r = await upload(shell, '../../evil.csv', ITEMS);
    expect(r.status).toBe(200);
    const stored = ctx.uploads.get(JSON.parse(r.body).value.upload as string)!;
    expect(stored.fileName).toBe('../../evil.csv');
    expect(path.basename(stored.path)).toBe('evil.csv');
    expect(path.relative(ctx.uploads.folder!, stored.path).startsWith('..')).toBe(false);
    expect(fs.existsSync(path.join(ctx.uploads.folder!, '..', 'evil.csv'))).toBe(false);
    const dots = ctx.uploads.get(JSON.parse((await upload(shell, '..', ITEMS)).body).value.upload as string)!;
    expect(path.dirname(path.dirname(dots.path))).toBe(ctx.uploads.folder);
  });

  it('answers 404 when the server was started without an upload store', async () => {
    const bare = await startWebShell({ table: createHandlerTable(ctx), staticDir: path.join(dir, 'renderer') });
    try {
      expect((await upload(bare, 'a.csv', ITEMS)).status).toBe(404);
    } finally {
      await bare.close();
    }
  });
});

describe('closing the context', () => {
  it('removes every upload and the private folder', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-upload-close-'));
    const ctx = new AppContext();
    ctx.open(path.join(dir, 'w.sqlite'), { create: true });
    const shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: dir });
    try {
      const r = await upload(shell, 'items.csv', ITEMS);
      expect(r.status).toBe(200);
      const folder = ctx.uploads.folder!;
      expect(filesUnder(folder)).toHaveLength(1);
      // Switching workspaces keeps a chosen file; closing the context does not.
      ctx.open(path.join(dir, 'other.sqlite'), { create: true });
      expect(filesUnder(folder)).toHaveLength(1);
      ctx.close();
      expect(fs.existsSync(folder)).toBe(false);
      expect(ctx.uploads.folder).toBeNull();
    } finally {
      await shell.close();
      ctx.close();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
