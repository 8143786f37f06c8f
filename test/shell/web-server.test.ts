import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHandlerTable } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { CONTENT_SECURITY_POLICY } from '../../src-main/shell/web/guard.ts';
import { startWebShell, type WebShell } from '../../src-main/shell/web/server.ts';
import { resolveStaticFile } from '../../src-main/shell/web/static.ts';

interface Reply {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: string;
}

/** Raw http.request, because fetch refuses to set Host and normalises `..` away. */
function request(shell: WebShell, opts: { method?: string; path: string; headers?: Record<string, string>; body?: string }): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const req = http.request(
      {
        host: '127.0.0.1',
        port: shell.port,
        method: opts.method ?? 'GET',
        path: opts.path,
        headers: { host: `127.0.0.1:${shell.port}`, ...opts.headers },
      },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks).toString('utf8') }));
      },
    );
    req.on('error', reject);
    if (opts.body !== undefined) req.write(opts.body);
    req.end();
  });
}

function api(shell: WebShell, method: string, payload: unknown, headers: Record<string, string> = {}): Promise<Reply> {
  return request(shell, {
    method: 'POST',
    path: `/api/${method}`,
    headers: { 'content-type': 'application/json', 'x-shelfwright-token': shell.token, ...headers },
    body: JSON.stringify(payload),
  });
}

describe('web shell', () => {
  let dir: string;
  let shell: WebShell;
  let ctx: AppContext;

  beforeAll(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-web-'));
    const root = path.join(dir, 'renderer');
    fs.mkdirSync(path.join(root, 'assets'), { recursive: true });
    fs.writeFileSync(path.join(root, 'index.html'), '<!doctype html><html><head><title>t</title></head><body></body></html>');
    fs.writeFileSync(path.join(root, 'assets', 'app.js'), 'console.log(1)');
    fs.writeFileSync(path.join(root, 'assets', 'app.css'), 'body{}');
    fs.writeFileSync(path.join(dir, 'secret.txt'), 'do not serve');
    ctx = new AppContext();
    ctx.open(path.join(dir, 'w.sqlite'), { create: true });
    shell = await startWebShell({ table: createHandlerTable(ctx), staticDir: root, maxBodyBytes: 4096 });
  });

  afterAll(async () => {
    await shell.close();
    ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('answers a valid call with the handler table result', async () => {
    const r = await api(shell, 'workspace.info', {});
    expect(r.status).toBe(200);
    const body = JSON.parse(r.body);
    expect(body).toMatchObject({ ok: true, value: { open: true, items: 0, customers: 0, signals: 0 } });
  });

  it('refuses an api call without the token or with a wrong one (401)', async () => {
    const none = await request(shell, { method: 'POST', path: '/api/workspace.info', headers: { 'content-type': 'application/json' }, body: '{}' });
    expect(none.status).toBe(401);
    const wrong = await api(shell, 'workspace.info', {}, { 'x-shelfwright-token': 'a'.repeat(64) });
    expect(wrong.status).toBe(401);
    expect(JSON.parse(wrong.body).error.message).toMatch(/token/);
  });

  it('refuses a foreign Host header (403), for pages and api alike', async () => {
    const page = await request(shell, { path: '/', headers: { host: `evil.example:${shell.port}` } });
    expect(page.status).toBe(403);
    expect(page.body).not.toContain(shell.token);
    const otherPort = await request(shell, { path: '/', headers: { host: `127.0.0.1:${shell.port + 1}` } });
    expect(otherPort.status).toBe(403);
    const call = await api(shell, 'workspace.info', {}, { host: 'rebound.example' });
    expect(call.status).toBe(403);
  });

  it('accepts localhost:<port> as Host', async () => {
    const r = await request(shell, { path: '/', headers: { host: `localhost:${shell.port}` } });
    expect(r.status).toBe(200);
  });

  it('refuses a cross-origin POST even with the token', async () => {
    const r = await api(shell, 'workspace.info', {}, { origin: 'http://evil.example' });
    expect(r.status).toBe(403);
  });

  it('serves index.html exactly as built, with no token in it, and the security headers set', async () => {
    const r = await request(shell, { path: '/' });
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toBe('text/html; charset=utf-8');
    // DESIGN.md: the web shell serves no secret to an unauthenticated request.
    expect(r.body).toBe(fs.readFileSync(path.join(dir, 'renderer', 'index.html'), 'utf8'));
    expect(JSON.stringify(r.headers) + r.body).not.toContain(shell.token);
    expect(r.headers['content-security-policy']).toBe(CONTENT_SECURITY_POLICY);
    expect(r.headers['content-security-policy']).toContain("default-src 'self'");
    expect(r.headers['x-content-type-options']).toBe('nosniff');
    expect(r.headers['referrer-policy']).toBe('no-referrer');
    expect(r.headers['cache-control']).toBe('no-store');
  });

  it('serves assets with their content types', async () => {
    const js = await request(shell, { path: '/assets/app.js' });
    expect(js.status).toBe(200);
    expect(js.headers['content-type']).toBe('text/javascript; charset=utf-8');
    const css = await request(shell, { path: '/assets/app.css' });
    expect(css.headers['content-type']).toBe('text/css; charset=utf-8');
  });

  it('refuses directory traversal in every spelling', async () => {
    for (const p of ['/../secret.txt', '/%2e%2e/secret.txt', '/assets/..%2f..%2fsecret.txt', '/assets/%2e%2e%5c..%5csecret.txt', '/%00index.html', '/assets']) {
      const r = await request(shell, { path: p });
      expect(r.status, p).toBe(404);
      expect(r.body, p).not.toContain('do not serve');
    }
  });

  it('refuses a symlink inside the root that points outside it', async () => {
    const link = path.join(dir, 'renderer', 'assets', 'leak.txt');
    fs.symlinkSync(path.join(dir, 'secret.txt'), link);
    const r = await request(shell, { path: '/assets/leak.txt' });
    expect(r.status).toBe(404);
    expect(r.body).not.toContain('do not serve');
  });

  it('keeps resolved paths inside the root even when given raw dot segments', () => {
    const root = path.join(dir, 'renderer');
    expect(resolveStaticFile(root, '/assets/app.js')).toBe(fs.realpathSync(path.join(root, 'assets', 'app.js')));
    expect(resolveStaticFile(root, '../secret.txt')).toBeNull();
    expect(resolveStaticFile(root, '/assets/../../secret.txt')).toBeNull();
    expect(resolveStaticFile(root, '%E0%A4%A')).toBeNull();
  });

  it('answers 400, not 500, to a malformed % sequence in the method name or the address', async () => {
    const call = await request(shell, {
      method: 'POST',
      path: '/api/workspace.info%E0%A4%A',
      headers: { 'content-type': 'application/json', 'x-shelfwright-token': shell.token },
      body: '{}',
    });
    expect(call.status).toBe(400);
    expect(JSON.parse(call.body)).toEqual({ ok: false, error: { code: 'input', message: 'the method name in the address is not valid percent-encoding' } });
    expect((await request(shell, { path: '/assets/%E0%A4%A' })).status).toBe(404);
  });

  it('gives the page address with the token only in its fragment', () => {
    expect(shell.pageUrl).toBe(`${shell.origin}#token=${shell.token}`);
    expect(new URL(shell.pageUrl).pathname + new URL(shell.pageUrl).search).toBe('/');
  });

  it('names an unknown method clearly', async () => {
    const r = await api(shell, 'workspace.explode', {});
    expect(r.status).toBe(400);
    expect(JSON.parse(r.body)).toEqual({ ok: false, error: { code: 'input', message: 'unknown method: workspace.explode' } });
  });

  it('turns a bad payload into an input error naming the field', async () => {
    const r = await api(shell, 'workspace.open', { file: 42 });
    expect(r.status).toBe(400);
    const body = JSON.parse(r.body);
    expect(body.ok).toBe(false);
    expect(body.error.code).toBe('input');
    expect(body.error.message).toMatch(/^file:/);
  });

  it('rejects a body that is not JSON, and one over the size limit', async () => {
    const bad = await request(shell, {
      method: 'POST',
      path: '/api/workspace.info',
      headers: { 'content-type': 'application/json', 'x-shelfwright-token': shell.token },
      body: '{nope',
    });
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.body).error.message).toMatch(/not valid JSON/);
    const big = await api(shell, 'workspace.open', { file: 'x'.repeat(5000) });
    expect(big.status).toBe(413);
  });

  it('refuses GET on the api and POST on files', async () => {
    expect((await request(shell, { path: '/api/workspace.info', headers: { 'x-shelfwright-token': shell.token } })).status).toBe(405);
    expect((await request(shell, { method: 'POST', path: '/index.html' })).status).toBe(405);
  });
});
