/**
 * Main's IPC handlers: calls are accepted only from the app's own page (app://heatlag/), every payload
 * goes through the contract's validation, and uploads must be bytes with a sane name.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { IPC_PREFIX, IPC_UPLOAD } from '../../app/api/contract.ts';

const handlers = new Map<string, (event: unknown, ...args: unknown[]) => Promise<unknown>>();
vi.mock('electron', () => ({
  ipcMain: { handle: (channel: string, fn: (event: unknown, ...args: unknown[]) => Promise<unknown>) => handlers.set(channel, fn) },
  protocol: { registerSchemesAsPrivileged: vi.fn(), handle: vi.fn() },
}));

const { registerIpc } = await import('../../app/main/ipc.ts');
const { openBackend } = await import('../../app/backend/backend.ts');

const root = path.resolve(import.meta.dirname, '../..');
let dir: string;
let close: () => void;
const fromApp = { senderFrame: { url: 'app://heatlag/index.html' } };
const fromElsewhere = { senderFrame: { url: 'https://example.com/' } };

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'heatlag-ipc-'));
  const backend = await openBackend({ dataDir: dir, mode: 'desktop', version: 'test', demoDir: path.join(root, 'assets', 'demo'), demo: false });
  close = backend.close;
  registerIpc(backend.handlers, backend.ctx.uploads, () => {});
});
afterAll(() => {
  close();
  rmSync(dir, { recursive: true, force: true });
});

describe('IPC handlers', () => {
  it('register one channel per method and one for uploads', () => {
    expect(handlers.has(`${IPC_PREFIX}createSite`)).toBe(true);
    expect(handlers.has(IPC_UPLOAD)).toBe(true);
  });

  it('answer the app page, validate its payload, and refuse other senders', async () => {
    const create = handlers.get(`${IPC_PREFIX}createSite`)!;
    expect(await create(fromApp, { name: 'Maple Street School' })).toMatchObject({ ok: true, value: { name: 'Maple Street School' } });
    expect(await create(fromApp, { name: 42 })).toMatchObject({ ok: false, error: { code: 'input' } });
    expect(await create(fromApp, { name: 'x', extra: true })).toMatchObject({ ok: false, error: { code: 'input' } });
    expect(await create(fromElsewhere, { name: 'Other' })).toMatchObject({ ok: false, error: { code: 'origin' } });
    expect(await create({}, { name: 'No frame' })).toMatchObject({ ok: false, error: { code: 'origin' } });
  });

  it('accept uploads as bytes with a name, nothing else', async () => {
    const upload = handlers.get(IPC_UPLOAD)!;
    const bytes = new TextEncoder().encode('time,indoor_c\n2024-01-01T00:00:00Z,20\n').buffer;
    expect(await upload(fromApp, 'a.csv', bytes)).toMatchObject({ ok: true, value: { name: 'a.csv' } });
    expect(await upload(fromApp, '', bytes)).toMatchObject({ ok: false, error: { code: 'input' } });
    expect(await upload(fromApp, 'a.csv', 'not bytes')).toMatchObject({ ok: false, error: { code: 'input' } });
    expect(await upload(fromElsewhere, 'a.csv', bytes)).toMatchObject({ ok: false, error: { code: 'origin' } });
  });
});
