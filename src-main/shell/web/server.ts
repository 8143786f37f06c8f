import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import http, { type IncomingMessage, type ServerResponse } from 'node:http';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { invoke, type HandlerTable } from '../../api/handler-table.ts';
import type { ApiError, ApiResult } from '../../api/define.ts';
import { MAX_STREAMED_UPLOAD_BYTES } from '../../api/contracts/data.ts';
import { sizeInWords, UploadRefused, type UploadStore } from '../../services/uploads.ts';
import { hostIsAllowed, originIsAllowed, requestToken, setSecurityHeaders, tokenMatches } from './guard.ts';
import { contentTypeOf, resolveStaticFile } from './static.ts';

export interface WebShellOptions {
  table: HandlerTable;
  /** The built renderer (dist/renderer). */
  staticDir: string;
  /** 0 (default) lets the system pick a free port. */
  port?: number;
  /** Fixed token for tests; by default 32 random bytes per launch. */
  token?: string;
  /** Largest accepted request body; uploads of CSV files go through the api, so this is generous. */
  maxBodyBytes?: number;
  /** Where `POST /upload` streams files to (the context's store); without it that route answers 404. */
  uploads?: UploadStore;
  /** Largest streamed upload; MAX_STREAMED_UPLOAD_BYTES (4 GiB) by default, lowered in tests. */
  maxUploadBytes?: number;
}

export interface WebShell {
  port: number;
  token: string;
  /** `http://127.0.0.1:<port>/` */
  origin: string;
  /** The page address with the token in its fragment (never sent to the server, never logged by proxies). */
  pageUrl: string;
  close(): Promise<void>;
}

const API_PREFIX = '/api/';
const DEFAULT_MAX_BODY = 32 * 1024 * 1024;
const UPLOAD_PATH = '/upload';
/** The header carrying the original file name of an upload, as encodeURIComponent wrote it. */
const FILE_NAME_HEADER = 'x-file-name';
/** A 4 GiB upload from a slow disk may take longer than Node's default five minutes per request. */
const REQUEST_TIMEOUT_MS = 60 * 60 * 1000;

/** HTTP status per api error code, so tools that read only the status still see failure. */
const STATUS: Record<ApiError['code'], number> = { input: 400, not_found: 404, cancelled: 409, conflict: 409, internal: 500 };

/**
 * The web shell: a loopback server that maps `POST /api/<method>` onto the handler table and serves the
 * built renderer. Thin by design (DESIGN.md, Shells): every check on a request's content is the api's.
 */
export async function startWebShell(options: WebShellOptions): Promise<WebShell> {
  const token = options.token ?? randomBytes(32).toString('hex');
  const maxBody = options.maxBodyBytes ?? DEFAULT_MAX_BODY;
  const maxUpload = options.maxUploadBytes ?? MAX_STREAMED_UPLOAD_BYTES;
  let port = 0;
  const server = http.createServer((req, res) => {
    setSecurityHeaders(res);
    handle(req, res).catch((e: unknown) => {
      if (!res.headersSent) sendError(res, 500, 'internal', `internal error: ${(e as Error).message}`);
      else res.destroy();
    });
  });
  server.requestTimeout = REQUEST_TIMEOUT_MS;

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    if (!hostIsAllowed(req.headers.host, port)) return sendError(res, 403, 'input', 'forbidden host');
    let url: URL;
    try {
      url = new URL(req.url ?? '/', `http://127.0.0.1:${port}`);
    } catch {
      return sendError(res, 400, 'input', 'malformed address');
    }
    if (url.pathname.startsWith(API_PREFIX)) return handleApi(req, res, url.pathname.slice(API_PREFIX.length));
    if (url.pathname === UPLOAD_PATH) return handleUpload(req, res);
    if (req.method !== 'GET' && req.method !== 'HEAD') return sendError(res, 405, 'input', 'method not allowed');
    return handleStatic(req, res, url.pathname);
  }

  async function handleApi(req: IncomingMessage, res: ServerResponse, method: string): Promise<void> {
    if (req.method !== 'POST') return sendError(res, 405, 'input', 'api calls use POST');
    if (!tokenMatches(requestToken(req), token)) return sendError(res, 401, 'input', 'missing or wrong launch token');
    if (!originIsAllowed(req.headers.origin, port)) return sendError(res, 403, 'input', 'forbidden origin');
    const name = decodedMethod(method);
    if (name === null) return refuse(req, res, 400, 'input', 'the method name in the address is not valid percent-encoding');
    const type = req.headers['content-type'] ?? '';
    if (!type.startsWith('application/json')) return sendError(res, 415, 'input', 'send the request as application/json');
    const body = await readBody(req, maxBody);
    if (body === null) {
      res.setHeader('Connection', 'close');
      return sendError(res, 413, 'input', `request larger than ${sizeInWords(maxBody)}`);
    }
    let payload: unknown;
    try {
      payload = body.length === 0 ? {} : JSON.parse(body.toString('utf8'));
    } catch {
      return sendError(res, 400, 'input', 'the request body is not valid JSON');
    }
    // Files come in as uploads and go out as downloads here: a field naming a server path is refused.
    const result = await invoke(options.table, name, payload, { serverPaths: 'refuse' });
    sendJson(res, result.ok ? 200 : STATUS[result.error.code], result);
  }

  /**
   * `POST /upload`: the raw bytes of one file, streamed to a private folder (never held in memory) so files
   * too big for a JSON string can still be imported. Answers `{ ok: true, value: { upload, bytes } }`.
   */
  async function handleUpload(req: IncomingMessage, res: ServerResponse): Promise<void> {
    if (req.method !== 'POST') return refuse(req, res, 405, 'input', 'uploads use POST');
    if (!tokenMatches(requestToken(req), token)) return refuse(req, res, 401, 'input', 'missing or wrong launch token');
    if (!originIsAllowed(req.headers.origin, port)) return refuse(req, res, 403, 'input', 'forbidden origin');
    if (!options.uploads) return refuse(req, res, 404, 'not_found', 'uploads are not available here');
    const type = req.headers['content-type'] ?? '';
    if (!type.startsWith('application/octet-stream')) {
      return refuse(req, res, 415, 'input', 'send the file as application/octet-stream');
    }
    const fileName = decodedFileName(req.headers[FILE_NAME_HEADER]);
    if (fileName === null) {
      return refuse(req, res, 400, 'input', `name the file in the ${FILE_NAME_HEADER} header (encodeURIComponent of its name)`);
    }
    if (Number(req.headers['content-length'] ?? '0') > maxUpload) {
      return refuse(req, res, 413, 'input', `the file is larger than ${sizeInWords(maxUpload)}`);
    }
    try {
      const upload = await options.uploads.receive(fileName, req, maxUpload);
      sendJson(res, 200, { ok: true, value: { upload: upload.id, bytes: upload.bytes } });
    } catch (e) {
      if (!(e instanceof UploadRefused)) throw e;
      refuse(req, res, e.reason === 'too_large' ? 413 : 400, 'input', e.message);
    }
  }

  /**
   * The built page, as built: it holds no token (DESIGN.md, Reliability and safety). The page reads the token
   * from the address's fragment, which only the launcher prints and opens and which browsers never send.
   */
  function handleStatic(req: IncomingMessage, res: ServerResponse, pathname: string): void {
    const wanted = pathname === '/' ? '/index.html' : pathname;
    const file = resolveStaticFile(options.staticDir, wanted);
    if (!file) return sendError(res, 404, 'not_found', 'not found');
    const isIndex = path.basename(file) === 'index.html' && path.dirname(file) === fs.realpathSync(options.staticDir);
    const bytes = fs.readFileSync(file);
    res.statusCode = 200;
    res.setHeader('Content-Type', contentTypeOf(file));
    res.setHeader('Content-Length', bytes.length);
    // The page names this build's hashed assets: always fetched fresh; the hashed assets themselves may be cached.
    res.setHeader('Cache-Control', isIndex ? 'no-store' : 'public, max-age=31536000, immutable');
    res.end(req.method === 'HEAD' ? undefined : bytes);
  }

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, '127.0.0.1', () => resolve());
  });
  port = (server.address() as AddressInfo).port;
  const origin = `http://127.0.0.1:${port}/`;
  return {
    port,
    token,
    origin,
    pageUrl: `${origin}#token=${token}`,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

/** How long a refused body is still read and dropped before its connection is cut. */
const REFUSED_BODY_GRACE_MS = 2_000;

/**
 * Answers an error before (or without) reading the whole request body. The rest of the body is read and
 * dropped for a moment, so a browser still sending sees the answer instead of a reset connection; then
 * the connection is cut, so a refused multi-gigabyte upload is not received in full. Nothing of it is kept.
 */
function refuse(req: IncomingMessage, res: ServerResponse, status: number, code: ApiError['code'], message: string): void {
  if (!req.readableEnded && !req.destroyed) {
    res.setHeader('Connection', 'close');
    req.resume();
    const cut = setTimeout(() => req.destroy(), REFUSED_BODY_GRACE_MS);
    cut.unref();
    req.once('end', () => clearTimeout(cut));
  }
  sendError(res, status, code, message);
}

/** The x-file-name header decoded, or null when it is missing, empty, repeated or not valid percent-encoding. */
function decodedFileName(header: string | string[] | undefined): string | null {
  if (typeof header !== 'string' || header === '') return null;
  try {
    const name = decodeURIComponent(header);
    return name.trim() === '' || name.includes('\0') ? null : name;
  } catch {
    return null;
  }
}

/** The method named in `/api/<method>`, decoded; null for a malformed `%` sequence (a 400, not a 500). */
function decodedMethod(raw: string): string | null {
  try {
    return decodeURIComponent(raw);
  } catch {
    return null;
  }
}

/** The body, or null once it passes the limit (the rest is not read: the connection is closed). */
function readBody(req: IncomingMessage, limit: number): Promise<Buffer | null> {
  return new Promise((resolve, reject) => {
    const declared = Number(req.headers['content-length'] ?? '0');
    if (declared > limit) {
      req.resume();
      return resolve(null);
    }
    const chunks: Buffer[] = [];
    let size = 0;
    let over = false;
    req.on('data', (chunk: Buffer) => {
      if (over) return;
      size += chunk.length;
      if (size > limit) {
        over = true;
        resolve(null);
        return;
      }
      chunks.push(chunk);
    });
    req.on('end', () => {
      if (!over) resolve(Buffer.concat(chunks));
    });
    req.on('error', reject);
  });
}

function sendJson(res: ServerResponse, status: number, body: ApiResult<unknown>): void {
  const text = JSON.stringify(body);
  res.statusCode = status;
  res.setHeader('Content-Type', 'application/json; charset=utf-8');
  res.setHeader('Cache-Control', 'no-store');
  res.setHeader('Content-Length', Buffer.byteLength(text));
  res.end(text);
}

function sendError(res: ServerResponse, status: number, code: ApiError['code'], message: string): void {
  sendJson(res, status, { ok: false, error: { code, message } });
}
