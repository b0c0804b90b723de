/**
 * The shape of the object the desktop preload exposes as `window.heatlag`: one function per contract
 * method (each returns the call's envelope; the renderer's client validates and unwraps it), plus the
 * upload of a file's bytes. The object is frozen; it never exposes ipcRenderer itself.
 */
import type { Envelope, FileRef, Method } from './contract.ts';

export type BridgeCall = (input: unknown) => Promise<Envelope<unknown>>;

export type PreloadBridge = Readonly<
  Record<Method, BridgeCall> & {
    /** Hands a dropped or chosen file's bytes to the main process, which keeps them as a temp file. */
    upload(name: string, bytes: ArrayBuffer): Promise<Envelope<FileRef>>;
    /** Subscribes to the application menu's commands (e.g. 'import', 'about'); returns an unsubscribe. */
    onMenu(listener: (command: string) => void): () => void;
    readonly kind: 'desktop';
  }
>;

/** Menu commands main may send to the renderer. */
export const MENU_COMMANDS = ['import', 'sites', 'history', 'response', 'recovery', 'estimate', 'about'] as const;
export type MenuCommand = (typeof MENU_COMMANDS)[number];
export const IPC_MENU = 'heatlag:menu';
