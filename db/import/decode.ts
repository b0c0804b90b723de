/**
 * Text encoding of a log file: UTF-8 (with or without BOM), UTF-16 LE/BE (BOM, or recognised by its
 * zero bytes), and Latin-1 / Windows-1252 when the bytes are not valid UTF-8. Binary files (spreadsheet
 * workbooks, databases, archives, anything with NUL bytes) are refused with a plain reason.
 *
 * Decoding uses the WHATWG TextDecoder in streaming mode, so a multi-byte character split between two
 * read chunks is decoded correctly.
 */
import { StringDecoder } from 'node:string_decoder';

export type TextEncoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

export interface EncodingGuess {
  encoding: TextEncoding;
  /** Bytes of byte-order mark at the start of the file (the decoder skips them). */
  bomLength: number;
}

/** Known binary formats people export by mistake, by their first bytes. */
const SIGNATURES: { bytes: number[]; what: string }[] = [
  { bytes: [0x50, 0x4b, 0x03, 0x04], what: 'a ZIP archive (an .xlsx or .ods workbook is one): save the sheet as CSV first' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], what: 'an old Excel (.xls) workbook: save the sheet as CSV first' },
  { bytes: [0x53, 0x51, 0x4c, 0x69, 0x74, 0x65, 0x20, 0x66], what: 'an SQLite database, not a log export' },
  { bytes: [0x25, 0x50, 0x44, 0x46], what: 'a PDF document, not a log export' },
  { bytes: [0x1f, 0x8b], what: 'a gzip-compressed file: uncompress it first' },
];

function startsWith(bytes: Uint8Array, sig: number[]): boolean {
  if (bytes.length < sig.length) return false;
  for (let i = 0; i < sig.length; i++) if (bytes[i] !== sig[i]) return false;
  return true;
}

/**
 * Guesses the encoding from the first bytes of a file (a few kilobytes or more). Returns a reason string
 * instead when the bytes are not text.
 */
export function sniffEncoding(bytes: Uint8Array): EncodingGuess | { binary: string; line?: number } {
  if (bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return { encoding: 'utf-8', bomLength: 3 };
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) return { encoding: 'utf-16le', bomLength: 2 };
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) return { encoding: 'utf-16be', bomLength: 2 };
  for (const s of SIGNATURES) if (startsWith(bytes, s.bytes)) return { binary: `the file is ${s.what}` };

  // UTF-16 without a BOM: ASCII text has a zero in every other byte.
  const n = Math.min(bytes.length, 4096) & ~1;
  if (n >= 8) {
    let evenZero = 0;
    let oddZero = 0;
    for (let i = 0; i < n; i += 2) {
      if (bytes[i] === 0) evenZero++;
      if (bytes[i + 1] === 0) oddZero++;
    }
    const pairs = n / 2;
    if (oddZero > 0.4 * pairs && evenZero < 0.05 * pairs) return { encoding: 'utf-16le', bomLength: 0 };
    if (evenZero > 0.4 * pairs && oddZero < 0.05 * pairs) return { encoding: 'utf-16be', bomLength: 0 };
  }

  // Binary: NUL bytes or many control characters (found by native searches: the sample is 256 KB).
  const zero = bytes.indexOf(0);
  if (zero >= 0) return zeroByte(bytes, zero, 0, 0);
  const controls = countMatches(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1'), CONTROL_BYTES);
  if (controls > Math.max(2, bytes.length * 0.005)) return { binary: `the file holds binary data (${controls} control bytes in the first ${bytes.length}), not text` };

  // Valid UTF-8? Decode in streaming mode so a character cut at the end of the sample is not an error.
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes, { stream: true });
    return { encoding: 'utf-8', bomLength: 0 };
  } catch {
    return { encoding: 'windows-1252', bomLength: 0 };
  }
}

/**
 * The refusal of a zero byte at `offset` (from the file's start) found at index `i` of `bytes`, with its
 * line: 1 + the line breaks before it (`breaksBefore` of them before `bytes`; LF, or CR in a file of CR
 * line ends).
 */
export function zeroByte(bytes: Uint8Array, i: number, offsetOfBytes: number, breaksBefore: number): { binary: string; line: number } {
  let lf = 0;
  let cr = 0;
  for (let k = 0; k < i; k++) {
    if (bytes[k] === 0x0a) lf++;
    else if (bytes[k] === 0x0d) cr++;
  }
  const line = 1 + breaksBefore + (lf > 0 || cr === 0 ? lf : cr);
  return { binary: `the file holds binary data (a zero byte on line ${line}, at byte offset ${offsetOfBytes + i}), not text`, line };
}

/** Control characters but NUL, tab, line feed, form feed and carriage return (NUL is looked for first). */
const CONTROL_BYTES = /[\x01-\x08\x0b\x0e-\x1f]/g;

/** How many times the global regular expression `re` matches in `text`. */
export function countMatches(text: string, re: RegExp): number {
  re.lastIndex = 0;
  let n = 0;
  while (re.exec(text) !== null) n++;
  return n;
}

/** Control characters other than tab, line breaks and form feed in decoded text (UTF-16 files, checked after decoding). */
export function countControlChars(text: string): number {
  let c = 0;
  for (let i = 0; i < text.length; i++) {
    const k = text.charCodeAt(i);
    if (k < 0x20 && k !== 0x09 && k !== 0x0a && k !== 0x0d && k !== 0x0c) c++;
  }
  return c;
}

/** A streaming decoder that also drops a byte-order mark (the WHATWG decoder does so by default). */
export function makeDecoder(encoding: TextEncoding): TextDecoder {
  return new TextDecoder(encoding, { fatal: false, ignoreBOM: false });
}

/** Chunks of bytes in, text out; a character split between chunks is kept until the next one. */
export interface StreamDecoder {
  write(chunk: Uint8Array): string;
  end(): string;
}

/**
 * The decoder of a whole file. UTF-8 and UTF-16 LE use Node's StringDecoder (native, about twice as fast
 * as TextDecoder on UTF-8); UTF-16 BE and Windows-1252 use TextDecoder in streaming mode. A byte-order
 * mark of `bomLength` bytes at the start is dropped. Invalid bytes become U+FFFD.
 */
export function makeStreamDecoder(encoding: TextEncoding, bomLength: number): StreamDecoder {
  let skip = bomLength;
  const dropBom = (chunk: Uint8Array): Uint8Array => {
    if (skip === 0) return chunk;
    const n = Math.min(skip, chunk.length);
    skip -= n;
    return chunk.subarray(n);
  };
  if (encoding === 'utf-8' || encoding === 'utf-16le') {
    const sd = new StringDecoder(encoding === 'utf-8' ? 'utf8' : 'utf16le');
    return { write: (c) => sd.write(toBuffer(dropBom(c))), end: () => sd.end() };
  }
  const td = new TextDecoder(encoding, { fatal: false, ignoreBOM: true });
  return { write: (c) => td.decode(dropBom(c), { stream: true }), end: () => td.decode() };
}

function toBuffer(c: Uint8Array): Buffer {
  return Buffer.isBuffer(c) ? c : Buffer.from(c.buffer, c.byteOffset, c.byteLength);
}
