/**
 * The browser-mode server's guards: loopback only, the per-launch token, same-origin requests to its
 * own host name, size limits, contract validation, and no file outside the built renderer.
 */
import { mkdtempSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBackend, type OpenBackend } from '../../app/backend/backend.ts';
import { startServer, type RunningServer } from '../../app/server/server.ts';

const root = path.resolve(import.meta.dirname, '../..');
let dir: string;
let backend: OpenBackend;
let server: RunningServer;

interface Reply {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
}

function send(method: string, urlPath: string, options: { headers?: Record<string, string>; body?: string | Buffer } = {}): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port: server.port, method, path: urlPath, headers: options.headers }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks).toString('utf8') }));
    });
    req.on('error', (err) => ((err as NodeJS.ErrnoException).code === 'ECONNRESET' || (err as NodeJS.ErrnoException).code === 'EPIPE' ? resolve({ status: -1, headers: {}, body: '' }) : reject(err)));
    if (options.body !== undefined) req.write(options.body);
    req.end();
  });
}

const api = (method: string, body: unknown, headers: Record<string, string> = {}) =>
  send('POST', `/api/${method}`, {
    headers: { 'content-type': 'application/json', 'x-heatlag-token': server.token, ...headers },
    body: JSON.stringify(body),
  });

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'heatlag-server-'));
  const staticDir = path.join(dir, 'static');
  mkdirSync(staticDir);
  writeFileSync(path.join(staticDir, 'index.html'), '<!doctype html><title>Heatlag</title>');
  writeFileSync(path.join(dir, 'secret.txt'), 'not for the page');
  backend = await openBackend({ dataDir: path.join(dir, 'data'), mode: 'browser', version: 'test', demoDir: path.join(root, 'assets', 'demo'), demo: false, maxUploadBytes: 64 * 1024 });
  server = await startServer({ handlers: backend.handlers, uploads: backend.ctx.uploads, staticDir, checkOutput: true, log: () => {} });
});

afterAll(async () => {
  await server.close();
  backend.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('browser-mode server', () => {
  it('listens on 127.0.0.1 only and prints the token in the fragment of its address', () => {
    const address = server.server.address();
    expect(typeof address === 'object' && address?.address).toBe('127.0.0.1');
    expect(server.url).toBe(`http://127.0.0.1:${server.port}/#token=${server.token}`);
    expect(server.token.length).toBeGreaterThanOrEqual(32);
  });

  it('answers a call with the token', async () => {
    const r = await api('createSite', { name: 'Elm Road Library' });
    expect(r.status).toBe(200);
    expect(JSON.parse(r.body)).toMatchObject({ ok: true, value: { name: 'Elm Road Library', zones: [] } });
  });

  it('refuses a call without the token, or with a wrong one', async () => {
    const none = await send('POST', '/api/listSites', { headers: { 'content-type': 'application/json' }, body: '{}' });
    expect(none.status).toBe(401);
    expect(JSON.parse(none.body).error.code).toBe('token');
    const wrong = await api('listSites', {}, { 'x-heatlag-token': 'x'.repeat(server.token.length) });
    expect(wrong.status).toBe(401);
  });

  it('refuses calls from other origins and cross-site fetches', async () => {
    expect((await api('listSites', {}, { origin: 'http://evil.example' })).status).toBe(403);
    expect((await api('listSites', {}, { 'sec-fetch-site': 'cross-site' })).status).toBe(403);
    expect((await api('listSites', {}, { origin: server.origin })).status).toBe(200);
  });

  it('refuses other host names (DNS rebinding)', async () => {
    const r = await api('listSites', {}, { host: `attacker.example:${server.port}` });
    expect(r.status).toBe(403);
    expect(JSON.parse(r.body).error.code).toBe('host');
  });

  it('refuses bodies over the size limit, non-JSON bodies and GET on the API', async () => {
    const big = await api('createSite', { name: 'x'.repeat(2 * 1024 * 1024) });
    expect([413, -1]).toContain(big.status);
    const text = await send('POST', '/api/listSites', { headers: { 'content-type': 'text/plain', 'x-heatlag-token': server.token }, body: '{}' });
    expect(text.status).toBe(415);
    expect((await send('GET', '/api/listSites', { headers: { 'x-heatlag-token': server.token } })).status).toBe(405);
  });

  it('validates every input against the contract before a handler runs', async () => {
    const bad = JSON.parse((await api('createSite', { name: '   ' })).body);
    expect(bad).toMatchObject({ ok: false, error: { code: 'input' } });
    expect(bad.error.message).toContain('name');
    const extra = JSON.parse((await api('listSites', { sql: 'DROP TABLE sites' })).body);
    expect(extra).toMatchObject({ ok: false, error: { code: 'input' } });
    const unknown = await api('dropEverything', {});
    expect(unknown.status).toBe(404);
    const sites = JSON.parse((await api('listSites', {})).body);
    expect(sites.value.length).toBe(1);
  });

  it('serves the renderer with a strict Content-Security-Policy and nothing outside its folder', async () => {
    const index = await send('GET', '/');
    expect(index.status).toBe(200);
    expect(String(index.headers['content-security-policy'])).toContain("script-src 'self'");
    expect(String(index.headers['content-security-policy'])).toContain("default-src 'none'");
    expect((await send('GET', '/../secret.txt')).status).toBe(404);
    expect((await send('GET', '/%2e%2e/secret.txt')).status).toBe(404);
  });

  it('streams an upload to a temp file, refuses one over the limit, and previews it', async () => {
    const csv = readFileSync(path.join(root, 'assets', 'demo', 'office-annex.csv')).subarray(0, 20_000);
    const ok = await send('POST', '/upload', {
      headers: { 'x-heatlag-token': server.token, 'x-heatlag-filename': encodeURIComponent('office-annex.csv'), 'content-type': 'application/octet-stream' },
      body: csv,
    });
    expect(ok.status).toBe(200);
    const ref = JSON.parse(ok.body).value;
    expect(ref).toMatchObject({ name: 'office-annex.csv', size: csv.length });
    const preview = JSON.parse((await api('previewLog', { fileId: ref.fileId, options: { timezone: 'Europe/Berlin' } })).body);
    expect(preview.ok).toBe(true);
    expect(preview.value).toMatchObject({ delimiter: ';', decimal: ',', file: 'office-annex.csv' });

    const tooBig = await send('POST', '/upload', {
      headers: { 'x-heatlag-token': server.token, 'x-heatlag-filename': 'big.csv', 'content-type': 'application/octet-stream' },
      body: Buffer.alloc(65 * 1024, 65),
    });
    expect([413, -1]).toContain(tooBig.status);
    const noToken = await send('POST', '/upload', { headers: { 'x-heatlag-filename': 'a.csv' }, body: 'a,b\n1,2\n' });
    expect(noToken.status).toBe(401);
  });
});
