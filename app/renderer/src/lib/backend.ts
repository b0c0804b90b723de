/**
 * The renderer's only way to the backend: the typed, validated client of app/api over the desktop
 * preload's bridge, or over HTTP in browser mode (token from the address's fragment).
 */
import type { PreloadBridge } from '../../../api/bridge.ts';
import { createApi } from '../../../api/client.ts';
import {
  ApiError,
  FileRefSchema,
  TOKEN_HEADER,
  type Envelope,
  type FileRef,
  type HeatlagApi,
} from '../../../api/contract.ts';
import { downloadBlob } from './download.ts';
import { isValidTimeZone, LOCAL_TIME_ZONE } from './time-zones.ts';

/**
 * Sent with every call that lays out a zone's days, so a zone with no time zone of its own is planned
 * and fitted in the zone this page shows its times in (the browser's, not the server's computer's).
 */
const CLIENT_DEFAULTS = isValidTimeZone(LOCAL_TIME_ZONE) ? { fallbackTimeZone: LOCAL_TIME_ZONE } : {};

export interface Backend {
  api: HeatlagApi;
  kind: 'desktop' | 'browser';
  /** Sends a file's bytes to the backend; onProgress(fraction 0–1) while it goes. */
  upload(file: File, onProgress?: (fraction: number) => void): Promise<FileRef>;
  /** Saves text the person asked to export; false when they cancelled. */
  saveText(suggestedName: string, content: string, mime?: string): Promise<boolean>;
  onMenu(listener: (command: string) => void): () => void;
}

declare global {
  interface Window {
    heatlag?: PreloadBridge;
  }
}

function unwrapRef(envelope: Envelope<unknown>): FileRef {
  if (!envelope.ok) throw new ApiError(envelope.error);
  return FileRefSchema.parse(envelope.value);
}

function desktopBackend(bridge: PreloadBridge): Backend {
  const api = createApi((method, input) => bridge[method](input), CLIENT_DEFAULTS);
  return {
    api,
    kind: 'desktop',
    async upload(file, onProgress) {
      onProgress?.(0);
      const bytes = await file.arrayBuffer();
      const ref = unwrapRef(await bridge.upload(file.name, bytes));
      onProgress?.(1);
      return ref;
    },
    saveText: (suggestedName, content) => api.saveTextFile({ suggestedName, content }),
    onMenu: (listener) => bridge.onMenu(listener),
  };
}

const TOKEN_KEY = 'heatlag-token';

/** Takes the token from #token=… (then removes it from the address bar) or from this tab's memory. */
function readToken(): string {
  const match = /(?:^#|&)token=([A-Za-z0-9_-]+)/.exec(window.location.hash);
  if (match?.[1]) {
    sessionStorage.setItem(TOKEN_KEY, match[1]);
    history.replaceState(null, '', window.location.pathname + window.location.search);
    return match[1];
  }
  return sessionStorage.getItem(TOKEN_KEY) ?? '';
}

function browserBackend(): Backend {
  const token = readToken();
  const api = createApi(async (method, input) => {
    let res: Response;
    try {
      res = await fetch(`./api/${method}`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', [TOKEN_HEADER]: token },
        body: JSON.stringify(input),
        credentials: 'omit',
      });
    } catch {
      return { ok: false, error: { code: 'offline', message: 'Heatlag’s local server is not answering: is it still running?' } };
    }
    try {
      return (await res.json()) as Envelope<unknown>;
    } catch {
      return { ok: false, error: { code: 'http', message: `Heatlag’s local server answered ${res.status} ${res.statusText}.` } };
    }
  }, CLIENT_DEFAULTS);
  return {
    api,
    kind: 'browser',
    upload(file, onProgress) {
      return new Promise<FileRef>((resolve, reject) => {
        const xhr = new XMLHttpRequest();
        xhr.open('POST', './upload');
        xhr.setRequestHeader(TOKEN_HEADER, token);
        xhr.setRequestHeader('x-heatlag-filename', encodeURIComponent(file.name));
        xhr.setRequestHeader('Content-Type', 'application/octet-stream');
        xhr.upload.onprogress = (e) => {
          if (e.lengthComputable && e.total > 0) onProgress?.(e.loaded / e.total);
        };
        xhr.onerror = () => reject(new ApiError({ code: 'offline', message: `${file.name} could not be sent to Heatlag’s local server.` }));
        xhr.onload = () => {
          try {
            resolve(unwrapRef(JSON.parse(xhr.responseText) as Envelope<unknown>));
          } catch (err) {
            reject(err instanceof ApiError ? err : new ApiError({ code: 'http', message: `The upload of ${file.name} failed (${xhr.status}).` }));
          }
        };
        xhr.send(file);
      });
    },
    async saveText(suggestedName, content, mime = 'text/csv') {
      downloadBlob(suggestedName, new Blob([content], { type: `${mime};charset=utf-8` }));
      return true;
    },
    onMenu: () => () => {},
  };
}

export function connectBackend(): Backend {
  return window.heatlag?.kind === 'desktop' ? desktopBackend(window.heatlag) : browserBackend();
}
