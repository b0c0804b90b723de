/**
 * IPC handlers: one channel per contract method (heatlag:<method>) plus the upload. Each call is
 * accepted only from the app's own page, and its payload goes through dispatch (contract
 * validation) before any service runs.
 */
import { Readable } from 'node:stream';
import { ipcMain, type IpcMainInvokeEvent } from 'electron';
import { IPC_PREFIX, IPC_UPLOAD, methodNames, type Envelope } from '../api/contract.ts';
import { dispatch, type Handlers } from '../backend/dispatch.ts';
import { toApiError } from '../backend/errors.ts';
import type { UploadRegistry } from '../backend/uploads.ts';
import { APP_ORIGIN } from './protocol.ts';

function fromApp(event: IpcMainInvokeEvent): boolean {
  const url = event.senderFrame?.url ?? '';
  return url.startsWith(APP_ORIGIN + '/');
}

const refused: Envelope<never> = { ok: false, error: { code: 'origin', message: 'Only the Heatlag window may call the backend.' } };

export function registerIpc(handlers: Handlers, uploads: UploadRegistry, log: (m: string) => void): void {
  for (const name of methodNames) {
    ipcMain.handle(IPC_PREFIX + name, (event, input: unknown) => (fromApp(event) ? dispatch(handlers, name, input, { log }) : refused));
  }
  ipcMain.handle(IPC_UPLOAD, async (event, name: unknown, bytes: unknown): Promise<Envelope<unknown>> => {
    if (!fromApp(event)) return refused;
    if (typeof name !== 'string' || name.length === 0 || name.length > 260) {
      return { ok: false, error: { code: 'input', message: 'The file needs a name of 1 to 260 characters.' } };
    }
    const buffer = bytes instanceof ArrayBuffer ? Buffer.from(bytes) : ArrayBuffer.isView(bytes) ? Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) : null;
    if (!buffer) return { ok: false, error: { code: 'input', message: 'The file’s contents did not arrive as bytes.' } };
    try {
      return { ok: true, value: await uploads.receive(name, Readable.from([buffer]), buffer.length) };
    } catch (err) {
      return { ok: false, error: toApiError(err, log) };
    }
  });
}
