/**
 * The browser-mode server against hostile requests (issue: fast and unbreakable), beyond the basic
 * guards of server.test.ts: it listens on 127.0.0.1 only (other loopback addresses are refused), refuses
 * every form of missing or wrong token, every other origin and host name (DNS rebinding), bodies over the
 * size limit with or without a declared length, malformed JSON, and every method's payload of the wrong
 * shape or types: 400 with a plain one-line message, and no handler runs.
 *
 * All traffic goes to loopback addresses of this machine.
 */
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { contract, MAX_JSON_BYTES, methodNames } from '../../app/api/contract.ts';
import { openBackend, type OpenBackend } from '../../app/backend/backend.ts';
import { startServer, type RunningServer } from '../../app/server/server.ts';

const root = path.resolve(import.meta.dirname, '../..');
let dir: string;
let backend: OpenBackend;
let server: RunningServer;
/** How many times a handler ran (wrapped below): a refused request must not move it. */
let handled = 0;

interface Reply {
  status: number;
  body: string;
}

function send(method: string, urlPath: string, headers: Record<string, string> = {}, body?: string | Buffer | Buffer[]): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port: server.port, method, path: urlPath, headers, setHost: !('host' in headers) }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body: Buffer.concat(chunks).toString('utf8') }));
    });
    req.on('error', (err) => {
      const code = (err as NodeJS.ErrnoException).code;
      if (code === 'ECONNRESET' || code === 'EPIPE') resolve({ status: -1, body: '' });
      else reject(err);
    });
    if (Array.isArray(body)) for (const b of body) req.write(b);
    else if (body !== undefined) req.write(body);
    req.end();
  });
}

const json = { 'content-type': 'application/json' };
const withToken = (extra: Record<string, string> = {}) => ({ ...json, 'x-heatlag-token': server.token, ...extra });
const call = (m: string, body: string, headers: Record<string, string> = withToken()) => send('POST', `/api/${m}`, headers, body);

/** A refusal: its status, the error code, a plain one-line message without internals. */
function refused(r: Reply, status: number, code: string): string {
  expect(r.status).toBe(status);
  const env = JSON.parse(r.body) as { ok: boolean; error: { code: string; message: string } };
  expect(env.ok).toBe(false);
  expect(env.error.code).toBe(code);
  expect(env.error.message).not.toMatch(/\n|\bat .*:\d+|ZodError|TypeError|SyntaxError|\{"/);
  expect(env.error.message.length).toBeLessThan(400);
  return env.error.message;
}

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'heatlag-guards-'));
  const staticDir = path.join(dir, 'static');
  mkdirSync(staticDir);
  writeFileSync(path.join(staticDir, 'index.html'), '<!doctype html><title>Heatlag</title>');
  backend = await openBackend({ dataDir: path.join(dir, 'data'), mode: 'browser', version: 'test', demoDir: path.join(root, 'assets', 'demo'), demo: false, maxUploadBytes: 64 * 1024 });
  const counted = Object.fromEntries(
    Object.entries(backend.handlers).map(([name, fn]) => [name, (input: unknown) => {
      handled++;
      return (fn as (i: unknown) => Promise<unknown>)(input);
    }]),
  ) as unknown as typeof backend.handlers;
  server = await startServer({ handlers: counted, uploads: backend.ctx.uploads, staticDir, log: () => {} });
});

afterAll(async () => {
  await server?.close();
  backend?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('binding', () => {
  function tryConnect(host: string): Promise<string> {
    return new Promise((resolve) => {
      const s = connect({ host, port: server.port });
      s.setTimeout(3000, () => {
        s.destroy();
        resolve('timeout');
      });
      s.once('connect', () => {
        s.destroy();
        resolve('connected');
      });
      s.once('error', (err) => resolve((err as NodeJS.ErrnoException).code ?? 'error'));
    });
  }

  it('accepts connections on 127.0.0.1 and on no other address of the loopback (not bound to all interfaces)', async () => {
    expect(await tryConnect('127.0.0.1')).toBe('connected');
    // Linux routes all of 127.0.0.0/8 to the loopback device: a server bound to 0.0.0.0 would answer here.
    expect(await tryConnect('127.0.0.2')).not.toBe('connected');
    expect(await tryConnect('::1')).not.toBe('connected');
  });
});

describe('the token', () => {
  it('refuses a missing, empty, wrong, truncated, extended or re-cased token, and one sent anywhere but its header', async () => {
    const t = server.token;
    const before = handled;
    const variants: Record<string, string>[] = [
      json,
      { ...json, 'x-heatlag-token': '' },
      { ...json, 'x-heatlag-token': 'A'.repeat(t.length) },
      { ...json, 'x-heatlag-token': t.slice(0, -1) },
      { ...json, 'x-heatlag-token': `${t}x` },
      { ...json, 'x-heatlag-token': t.toUpperCase() === t ? t.toLowerCase() : t.toUpperCase() },
      { ...json, authorization: `Bearer ${t}` },
      { ...json, cookie: `x-heatlag-token=${t}; token=${t}` },
    ];
    for (const h of variants) refused(await call('createSite', '{"name":"Intruder"}', h), 401, 'token');
    refused(await send('POST', `/api/createSite?token=${t}`, json, '{"name":"Intruder"}'), 401, 'token');
    refused(await send('POST', '/upload', { 'x-heatlag-filename': 'a.csv' }, 'time,indoor_c\n'), 401, 'token');
    expect(handled).toBe(before);
    const sites = JSON.parse((await call('listSites', '{}')).body) as { value: unknown[] };
    expect(sites.value).toEqual([]);
    expect(handled).toBe(before + 1); // the counter does see a call that gets through
  });
});

describe('origins and host names', () => {
  it('refuses every other origin, even with the right token', async () => {
    const p = server.port;
    const before = handled;
    for (const origin of ['http://evil.example', 'null', `http://127.0.0.1:${p === 1 ? 2 : 1}`, `https://127.0.0.1:${p}`, `http://127.0.0.1.evil.example:${p}`, `http://localhost.evil.example:${p}`, `http://[::1]:${p}`, `http://127.0.0.1:${p}.evil.example`]) {
      refused(await call('listSites', '{}', withToken({ origin })), 403, 'origin');
    }
    for (const site of ['cross-site', 'same-site']) refused(await call('listSites', '{}', withToken({ 'sec-fetch-site': site })), 403, 'origin');
    refused(await send('POST', '/upload', { 'x-heatlag-token': server.token, origin: 'http://evil.example' }, 'a,b\n'), 403, 'origin');
    expect(handled).toBe(before);
    for (const origin of [`http://127.0.0.1:${p}`, `http://localhost:${p}`]) expect((await call('listSites', '{}', withToken({ origin }))).status).toBe(200);
  });

  it('answers only to its own host name and port (DNS rebinding), for the API, uploads and pages alike', async () => {
    const p = server.port;
    const hosts = ['attacker.example', `attacker.example:${p}`, '127.0.0.1', `127.0.0.1:${p + 1 > 65535 ? p - 1 : p + 1}`, `localhost.attacker.example:${p}`, `127.0.0.1.attacker.example:${p}`, `0.0.0.0:${p}`, `[::1]:${p}`, ''];
    const before = handled;
    for (const host of hosts) {
      refused(await call('listSites', '{}', withToken({ host })), 403, 'host');
      refused(await send('GET', '/', { host }), 403, 'host');
      refused(await send('POST', '/upload', { host, 'x-heatlag-token': server.token }, 'a,b\n'), 403, 'host');
    }
    expect(handled).toBe(before);
    expect((await send('GET', '/', { host: `localhost:${p}` })).status).toBe(200);
  });
});

describe('size limits', () => {
  it('refuses a JSON body over the limit whether or not it declares its length, and keeps serving', async () => {
    const before = handled;
    const big = `{"name":"${'x'.repeat(MAX_JSON_BYTES + 10)}"}`;
    const declared = await call('createSite', big);
    expect([413, -1]).toContain(declared.status);
    if (declared.status === 413) refused(declared, 413, 'too-large');
    // Chunked: no Content-Length, the limit is counted as the bytes arrive.
    const piece = Buffer.alloc(256 * 1024, 'x');
    const chunked = await send('POST', '/api/createSite', withToken({ 'transfer-encoding': 'chunked' }), [Buffer.from('{"name":"'), ...Array(6).fill(piece), Buffer.from('"}')]);
    expect([413, -1]).toContain(chunked.status);
    const upload = await send('POST', '/upload', { 'x-heatlag-token': server.token, 'x-heatlag-filename': 'big.csv', 'transfer-encoding': 'chunked' }, Array(2).fill(Buffer.alloc(40 * 1024, 'a')));
    expect([413, -1]).toContain(upload.status);
    expect(handled).toBe(before);
    expect((await call('listSites', '{}')).status).toBe(200);
  });
});

describe('payload validation', () => {
  it('answers malformed JSON with 400 and a plain message', async () => {
    const before = handled;
    for (const body of ['{', '{"name":', 'nul', "{'name':'x'}", '{"name":"x",}', '\u0000', '[1,2', '{"a":1}{"b":2}']) {
      expect(refused(await call('createSite', body), 400, 'input')).toBe('The request body is not valid JSON.');
    }
    expect(refused(await send('POST', '/api/listSites', { 'content-type': 'text/plain', 'x-heatlag-token': server.token }, '{}'), 415, 'content-type')).toMatch(/JSON/);
    expect(handled).toBe(before);
  });

  it(`answers every method's payload of the wrong shape with 400 before any handler runs (${methodNames.length} methods)`, async () => {
    const before = handled;
    for (const m of methodNames) {
      // Not an object at all.
      for (const body of ['42', '"text"', '[1,2]', 'true']) {
        expect(refused(await call(m, body), 400, 'input'), `${m} ${body}`).toMatch(new RegExp(`^The request to ${m} was not valid`));
      }
      // An unknown key (the schemas are strict), and every known key of the wrong type.
      refused(await call(m, '{"zzz":1}'), 400, 'input');
      const shape = (contract[m].input as unknown as { shape?: Record<string, unknown> }).shape;
      const keys = shape ? Object.keys(shape) : [];
      if (keys.length > 0) refused(await call(m, JSON.stringify(Object.fromEntries(keys.map((k) => [k, [[['x']]]])))), 400, 'input');
    }
    expect(handled).toBe(before);
  });

  it('checks the types and ranges of fields, and cannot be polluted through __proto__', async () => {
    const before = handled;
    const cases: [string, unknown][] = [
      ['createSite', { name: 5 }],
      ['createSite', { name: '' }],
      ['createSite', { name: 'x'.repeat(100_000) }],
      ['renameSite', { siteId: '1', name: 'A' }],
      ['renameSite', { siteId: 1.5, name: 'A' }],
      ['deleteSite', { siteId: -1 }],
      ['setSiteTimezone', { siteId: 1, timezone: 'Mars/Olympus_Mons' }],
      ['setSiteTimezone', { siteId: 1, timezone: '' }],
      ['setSiteTimezone', { siteId: 1, timezone: 'America/Denver; DROP TABLE sites' }],
      ['setSiteTimezone', { siteId: 1, timezone: 'x'.repeat(100_000) }],
      ['setSiteTimezone', { siteId: 1, timezone: -7 }],
      ['setSiteTimezone', { siteId: 1 }],
      ['setSiteTimezone', { siteId: 0, timezone: 'UTC' }],
      ['zoneHistory', { zoneId: 1, fromMs: 'yesterday', buckets: 100, runtimeBinHours: 1 }],
      ['zoneHistory', { zoneId: null, buckets: 100, runtimeBinHours: 1 }],
      ['zoneHistory', { zoneId: 1, buckets: 1e9, runtimeBinHours: 1 }],
      ['zoneHistory', { zoneId: 1, buckets: 100, runtimeBinHours: 5 }],
      ['createSite', JSON.parse('{"name":"A","__proto__":{"polluted":true}}')],
    ];
    for (const [m, input] of cases) {
      const body = m === 'createSite' && typeof input === 'object' && input !== null && Object.hasOwn(input, '__proto__') ? '{"name":"A","__proto__":{"polluted":true}}' : JSON.stringify(input);
      expect(refused(await call(m, body), 400, 'input'), `${m} ${body.slice(0, 60)}`).toMatch(new RegExp(`^The request to ${m} was not valid`));
    }
    expect(({} as { polluted?: boolean }).polluted).toBeUndefined();
    expect(handled).toBe(before);
    // Unknown methods, including the names every object inherits.
    for (const m of ['dropEverything', 'constructor', '__proto__', 'toString', 'hasOwnProperty']) refused(await call(m, '{}'), 404, 'unknown-method');
    expect(handled).toBe(before);
  });
});
