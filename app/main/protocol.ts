/**
 * The app:// protocol that serves the built renderer (dist/renderer) to the desktop window, with the
 * same Content-Security-Policy and headers as the browser mode. Nothing outside that folder is served.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { protocol } from 'electron';
import { SECURITY_HEADERS } from '../backend/csp.ts';

export const APP_SCHEME = 'app';
export const APP_HOST = 'heatlag';
export const APP_ORIGIN = `${APP_SCHEME}://${APP_HOST}`;

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.map': 'application/json',
};

/** Must run before app is ready. */
export function registerScheme(): void {
  protocol.registerSchemesAsPrivileged([
    { scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true, codeCache: true } },
  ]);
}

export function serveRenderer(rendererDir: string): void {
  const base = path.resolve(rendererDir);
  protocol.handle(APP_SCHEME, (request) => {
    const url = new URL(request.url);
    if (url.host !== APP_HOST) return new Response('Not found', { status: 404 });
    let rel = decodeURIComponent(url.pathname);
    if (rel === '/' || rel === '') rel = '/index.html';
    const file = path.resolve(base, '.' + rel);
    if (!file.startsWith(base + path.sep) || !existsSync(file) || !statSync(file).isFile()) {
      return new Response('Not found', { status: 404 });
    }
    const type = TYPES[path.extname(file).toLowerCase()] ?? 'application/octet-stream';
    return new Response(readFileSync(file), { status: 200, headers: { ...SECURITY_HEADERS, 'Content-Type': type } });
  });
}
