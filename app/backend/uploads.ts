/**
 * Uploaded logs: files the person chose (by drag and drop, a file input or the desktop's open
 * dialog), kept in a private temporary folder under an opaque id until they are imported or
 * discarded. The renderer only ever holds the id, never a path.
 */
import { randomBytes } from 'node:crypto';
import { createWriteStream, mkdirSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import type { Readable } from 'node:stream';
import { MAX_UPLOAD_BYTES, type FileRef } from '../api/contract.ts';
import { ServiceError } from './errors.ts';

interface Entry {
  ref: FileRef;
  path: string;
  /** True for copies in our temp folder (deleted when discarded); false for the person's own file. */
  owned: boolean;
}

/** Keeps a display name safe to show: no folders, no control characters, at most 200 characters. */
export function displayName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? 'log';
  const clean = base.replace(/[\u0000-\u001f\u007f]/g, '').trim().slice(0, 200);
  return clean || 'log';
}

export class UploadRegistry {
  private readonly dir: string;
  private readonly entries = new Map<string, Entry>();
  readonly maxBytes: number;

  constructor(maxBytes = MAX_UPLOAD_BYTES) {
    this.dir = mkdtempSync(path.join(tmpdir(), 'heatlag-uploads-'));
    this.maxBytes = maxBytes;
  }

  private newId(): string {
    return randomBytes(18).toString('base64url');
  }

  /** Streams `body` into a temp file, refusing more than maxBytes. */
  async receive(name: string, body: Readable, declaredLength?: number): Promise<FileRef> {
    const shown = displayName(name);
    if (declaredLength !== undefined && declaredLength > this.maxBytes) {
      throw new ServiceError('too-large', `${shown} is larger than the ${formatMiB(this.maxBytes)} an import accepts.`);
    }
    const fileId = this.newId();
    // Each upload gets its own folder and keeps its own name, so the log is recorded under the name the
    // person knows (characters that no file system allows are replaced).
    const folder = path.join(this.dir, fileId);
    mkdirSync(folder, { mode: 0o700 });
    const file = path.join(folder, shown.replace(/[<>:"/\\|?*]/g, '_').replace(/^\.+/, '_'));
    let size = 0;
    const limit = this.maxBytes;
    const counter = async function* (source: AsyncIterable<Buffer>) {
      for await (const chunk of source) {
        size += chunk.length;
        if (size > limit) {
          throw new ServiceError('too-large', `${shown} is larger than the ${formatMiB(limit)} an import accepts.`);
        }
        yield chunk;
      }
    };
    try {
      await pipeline(body, counter, createWriteStream(file, { mode: 0o600 }));
    } catch (err) {
      rmSync(folder, { recursive: true, force: true });
      throw err;
    }
    const ref: FileRef = { fileId, name: shown, size };
    this.entries.set(fileId, { ref, path: file, owned: true });
    return ref;
  }

  /** Registers a file the person picked in a native dialog (read where it is, never copied). */
  registerExisting(file: string): FileRef {
    const size = statSync(file).size;
    const ref: FileRef = { fileId: this.newId(), name: displayName(path.basename(file)), size };
    this.entries.set(ref.fileId, { ref, path: file, owned: false });
    return ref;
  }

  /** The path and name behind an id, or a plain error when the id is unknown. */
  resolve(fileId: string): { path: string; ref: FileRef } {
    const entry = this.entries.get(fileId);
    if (!entry) throw new ServiceError('not-found', 'That file is no longer available: choose it again.');
    return { path: entry.path, ref: entry.ref };
  }

  discard(fileId: string): boolean {
    const entry = this.entries.get(fileId);
    if (!entry) return false;
    this.entries.delete(fileId);
    if (entry.owned) rmSync(path.dirname(entry.path), { recursive: true, force: true });
    return true;
  }

  /** Removes the temp folder and everything in it. */
  dispose(): void {
    this.entries.clear();
    rmSync(this.dir, { recursive: true, force: true });
  }
}

export function formatMiB(bytes: number): string {
  return `${Math.round(bytes / (1024 * 1024))} MiB`;
}
