/**
 * Browser mode: the built renderer and the same API contract over HTTP, on 127.0.0.1 only.
 *
 * - GET  /…                 the built renderer (dist/renderer), with a strict Content-Security-Policy.
 * - POST /api/<method>      a JSON body validated against the contract; answers the call's envelope.
 * - POST /upload            a log's raw bytes (header x-heatlag-filename), streamed to a temp file.
 *
 * Every API and upload request must carry the per-launch token in the x-heatlag-token header, come
 * from the app's own origin (Origin and Sec-Fetch-Site checked when the browser sends them) to the
 * app's own host name (against DNS rebinding), and stay under a size limit. The token reaches the
 * page in the URL's fragment, which browsers never send to a server.
 */
import { randomBytes, timingSafeEqual } from 'node:crypto';
import { createReadStream, existsSync, statSync } from 'node:fs';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { contract, describeZodError, isMethod, MAX_JSON_BYTES, TOKEN_HEADER, type Envelope } from '../api/contract.ts';
import { SECURITY_HEADERS } from '../backend/csp.ts';
import { dispatch, type Handlers } from '../backend/dispatch.ts';
import { toApiError } from '../backend/errors.ts';
import type { UploadRegistry } from '../backend/uploads.ts';

export const HOST = '127.0.0.1';

export interface ServerOptions {
  handlers: Handlers;
  uploads: UploadRegistry;
  /** Folder of the built renderer; when missing, pages answer with a plain message. */
  staticDir: string;
  /** 0 picks a free port. */
  port?: number;
  /** Fixed token (tests); a random one otherwise. */
  token?: string;
  maxJsonBytes?: number;
  checkOutput?: boolean;
  log?: (msg: string) => void;
}

export interface RunningServer {
  server: Server;
  port: number;
  token: string;
  origin: string;
  /** The address to open, with the token in its fragment. */
  url: string;
  close(): Promise<void>;
}

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.json': 'application/json',
  '.map': 'application/json',
};

function send(res: ServerResponse, status: number, body: string | Buffer, type: string, extra: Record<string, string> = {}) {
  res.writeHead(status, { ...SECURITY_HEADERS, 'Content-Type': type, 'Cache-Control': 'no-store', ...extra });
  res.end(body);
}

function sendJson(res: ServerResponse, status: number, envelope: Envelope<unknown>) {
  send(res, status, JSON.stringify(envelope), 'application/json; charset=utf-8');
}

function refuse(res: ServerResponse, status: number, code: string, message: string) {
  sendJson(res, status, { ok: false, error: { code, message } });
}

function sameToken(given: string | undefined, token: string): boolean {
  if (!given) return false;
  const a = Buffer.from(given);
  const b = Buffer.from(token);
  return a.length === b.length && timingSafeEqual(a, b);
}

/** Reads a body up to `limit` bytes; rejects with a 413 marker beyond it. */
function readBody(req: IncomingMessage, limit: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const declared = Number(req.headers['content-length']);
    if (Number.isFinite(declared) && declared > limit) {
      reject(Object.assign(new Error('too large'), { status: 413 }));
      req.resume();
      return;
    }
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size > limit) {
        reject(Object.assign(new Error('too large'), { status: 413 }));
        req.destroy();
        return;
      }
      chunks.push(chunk);
    });
    req.on('end', () => resolve(Buffer.concat(chunks)));
    req.on('error', reject);
  });
}

export function startServer(options: ServerOptions): Promise<RunningServer> {
  const token = options.token ?? randomBytes(24).toString('base64url');
  const maxJson = options.maxJsonBytes ?? MAX_JSON_BYTES;
  const log = options.log ?? ((m: string) => console.error(m));
  const staticDir = path.resolve(options.staticDir);
  let port = 0;
  let allowedHosts = new Set<string>();
  let allowedOrigins = new Set<string>();

  /** The checks every API and upload request passes before anything is read. */
  function guard(req: IncomingMessage, res: ServerResponse): boolean {
    if (req.method !== 'POST') {
      refuse(res, 405, 'method', 'Only POST is accepted here.');
      return false;
    }
    const origin = req.headers.origin;
    if (origin !== undefined && !allowedOrigins.has(origin)) {
      refuse(res, 403, 'origin', 'Requests from other web sites are refused.');
      return false;
    }
    const site = req.headers['sec-fetch-site'];
    if (site !== undefined && site !== 'same-origin' && site !== 'none') {
      refuse(res, 403, 'origin', 'Requests from other web sites are refused.');
      return false;
    }
    const given = req.headers[TOKEN_HEADER];
    if (!sameToken(Array.isArray(given) ? given[0] : given, token)) {
      refuse(res, 401, 'token', 'This request does not carry the token of this Heatlag session: open the address Heatlag printed.');
      return false;
    }
    return true;
  }

  async function handleApi(req: IncomingMessage, res: ServerResponse, method: string) {
    if (!guard(req, res)) return;
    const type = String(req.headers['content-type'] ?? '');
    if (!type.startsWith('application/json')) {
      refuse(res, 415, 'content-type', 'The request body must be JSON.');
      return;
    }
    let input: unknown;
    try {
      const body = await readBody(req, maxJson);
      input = body.length ? JSON.parse(body.toString('utf8')) : {};
    } catch (err) {
      if ((err as { status?: number }).status === 413) {
        refuse(res, 413, 'too-large', 'The request is too large.');
      } else {
        refuse(res, 400, 'input', 'The request body is not valid JSON.');
      }
      return;
    }
    // A payload outside the contract is a bad request (400); dispatch checks it again for IPC's sake.
    if (isMethod(method)) {
      const parsed = contract[method].input.safeParse(input ?? {});
      if (!parsed.success) {
        refuse(res, 400, 'input', describeZodError(method, parsed.error));
        return;
      }
    }
    const envelope = await dispatch(options.handlers, method, input, { checkOutput: options.checkOutput, log });
    const status = envelope.ok ? 200 : envelope.error.code === 'unknown-method' ? 404 : 200;
    sendJson(res, status, envelope);
  }

  async function handleUpload(req: IncomingMessage, res: ServerResponse) {
    if (!guard(req, res)) return;
    const rawName = req.headers['x-heatlag-filename'];
    let name = 'log.csv';
    try {
      if (typeof rawName === 'string') name = decodeURIComponent(rawName);
    } catch {
      /* keep the default name */
    }
    const declared = Number(req.headers['content-length']);
    if (Number.isFinite(declared) && declared > options.uploads.maxBytes) {
      refuse(res, 413, 'too-large', `${name} is larger than an import accepts.`);
      req.resume();
      return;
    }
    try {
      const ref = await options.uploads.receive(name, req, Number.isFinite(declared) ? declared : undefined);
      sendJson(res, 200, { ok: true, value: ref });
    } catch (err) {
      const info = toApiError(err, log);
      if (!res.headersSent) sendJson(res, info.code === 'too-large' ? 413 : 400, { ok: false, error: info });
      req.destroy();
    }
  }

  function handleStatic(req: IncomingMessage, res: ServerResponse, pathname: string) {
    if (req.method !== 'GET' && req.method !== 'HEAD') {
      send(res, 405, 'Method not allowed', 'text/plain; charset=utf-8');
      return;
    }
    let rel: string;
    try {
      rel = decodeURIComponent(pathname);
    } catch {
      send(res, 400, 'Bad path', 'text/plain; charset=utf-8');
      return;
    }
    if (rel === '/' || rel === '') rel = '/index.html';
    const file = path.resolve(staticDir, '.' + rel);
    if (!file.startsWith(staticDir + path.sep) || rel.includes('\0')) {
      send(res, 404, 'Not found', 'text/plain; charset=utf-8');
      return;
    }
    if (!existsSync(file) || !statSync(file).isFile()) {
      if (rel === '/index.html') {
        send(res, 503, 'The user interface is not built yet: run `npm run build` first.', 'text/plain; charset=utf-8');
      } else {
        send(res, 404, 'Not found', 'text/plain; charset=utf-8');
      }
      return;
    }
    const type = TYPES[path.extname(file).toLowerCase()] ?? 'application/octet-stream';
    const cache = rel.startsWith('/assets/') ? 'public, max-age=31536000, immutable' : 'no-cache';
    res.writeHead(200, { ...SECURITY_HEADERS, 'Content-Type': type, 'Cache-Control': cache, 'Content-Length': statSync(file).size });
    if (req.method === 'HEAD') {
      res.end();
      return;
    }
    createReadStream(file).pipe(res);
  }

  const server = createServer((req, res) => {
    const host = req.headers.host ?? '';
    if (!allowedHosts.has(host)) {
      refuse(res, 403, 'host', 'This server answers only to its own loopback address.');
      req.resume();
      return;
    }
    const pathname = (req.url ?? '/').split('?')[0] ?? '/';
    const run = async () => {
      if (pathname.startsWith('/api/')) return handleApi(req, res, pathname.slice(5));
      if (pathname === '/upload') return handleUpload(req, res);
      return handleStatic(req, res, pathname);
    };
    run().catch((err) => {
      log(`heatlag: server error: ${(err as Error).stack ?? String(err)}`);
      if (!res.headersSent) refuse(res, 500, 'internal', 'Something went wrong inside Heatlag.');
      else res.destroy();
    });
  });
  server.requestTimeout = 0; // long uploads
  server.headersTimeout = 30_000;

  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, HOST, () => {
      port = (server.address() as AddressInfo).port;
      allowedHosts = new Set([`${HOST}:${port}`, `localhost:${port}`]);
      allowedOrigins = new Set([`http://${HOST}:${port}`, `http://localhost:${port}`]);
      const origin = `http://${HOST}:${port}`;
      resolve({
        server,
        port,
        token,
        origin,
        url: `${origin}/#token=${token}`,
        close: () =>
          new Promise<void>((done) => {
            server.closeAllConnections();
            server.close(() => done());
          }),
      });
    });
  });
}
