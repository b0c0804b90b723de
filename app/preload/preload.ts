/**
 * The desktop preload (sandboxed, context-isolated): exposes exactly one frozen object,
 * `window.heatlag`, with one function per contract method and the file upload. It never exposes
 * ipcRenderer; each function invokes only its own channel. Main validates every payload.
 */
import { contextBridge, ipcRenderer } from 'electron';
import { IPC_MENU, MENU_COMMANDS, type PreloadBridge } from '../api/bridge.ts';
import { IPC_PREFIX, IPC_UPLOAD, methodNames, type Envelope, type FileRef } from '../api/contract.ts';

const calls: Record<string, (input: unknown) => Promise<Envelope<unknown>>> = {};
for (const name of methodNames) {
  const channel = IPC_PREFIX + name;
  calls[name] = (input: unknown) => ipcRenderer.invoke(channel, input) as Promise<Envelope<unknown>>;
}

const bridge = Object.freeze({
  ...calls,
  upload: (name: string, bytes: ArrayBuffer) => ipcRenderer.invoke(IPC_UPLOAD, String(name), bytes) as Promise<Envelope<FileRef>>,
  onMenu: (listener: (command: string) => void) => {
    const handler = (_event: unknown, command: unknown) => {
      if (typeof command === 'string' && (MENU_COMMANDS as readonly string[]).includes(command)) listener(command);
    };
    ipcRenderer.on(IPC_MENU, handler);
    return () => {
      ipcRenderer.removeListener(IPC_MENU, handler);
    };
  },
  kind: 'desktop' as const,
}) as PreloadBridge;

contextBridge.exposeInMainWorld('heatlag', bridge);
