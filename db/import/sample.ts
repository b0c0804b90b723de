/**
 * The sample of a log file: its first SAMPLE_BYTES read and decoded (encoding sniffed, binary files,
 * runaway lines and non-text refused), from which the import plan (plan.ts) is decided.
 */
import { open, stat } from 'node:fs/promises';
import { basename } from 'node:path';
import { ImportError } from '../errors.ts';
import { countControlChars, countMatches, makeDecoder, sniffEncoding, type TextEncoding } from './decode.ts';
import { countChar } from './detect.ts';

/** Bytes read for the detection. */
export const SAMPLE_BYTES = 256 * 1024;

export interface Sample {
  /** The file's name, no directory (for messages). */
  file: string;
  path: string;
  bytes: number;
  encoding: TextEncoding;
  /** Decoded text of the first SAMPLE_BYTES, cut after its last complete line unless it is the whole file. */
  text: string;
  whole: boolean;
  /** Bytes the sample was decoded from. */
  sampleBytes: number;
  /** Bytes of byte-order mark at the start of the file. */
  bomLength: number;
}

/** Reads and decodes the beginning of a file. Throws ImportError for a missing, empty or binary file. */
export async function readSample(path: string): Promise<Sample> {
  const file = basename(path);
  let size: number;
  try {
    const st = await stat(path);
    if (st.isDirectory()) throw new ImportError(file, 'this is a folder, not a log file');
    size = st.size;
  } catch (err) {
    if (err instanceof ImportError) throw err;
    const code = (err as NodeJS.ErrnoException).code;
    throw new ImportError(file, code === 'ENOENT' ? `the file does not exist (${path})` : `cannot read the file (${(err as Error).message})`, {}, { cause: err });
  }
  if (size === 0) throw new ImportError(file, 'the file is empty');
  const fh = await open(path, 'r');
  let bytes: Uint8Array;
  try {
    const buf = Buffer.alloc(Math.min(size, SAMPLE_BYTES));
    const { bytesRead } = await fh.read(buf, 0, buf.length, 0);
    bytes = buf.subarray(0, bytesRead);
  } finally {
    await fh.close();
  }
  const guess = sniffEncoding(bytes);
  if ('binary' in guess) throw new ImportError(file, `${guess.binary}. Export the log as CSV or TSV text.`, { line: guess.line });
  const whole = bytes.length >= size;
  let text = makeDecoder(guess.encoding).decode(bytes, { stream: !whole });
  if (guess.encoding.startsWith('utf-16') && countControlChars(text) > Math.max(2, text.length * 0.005)) {
    throw new ImportError(file, 'the file holds binary data, not text. Export the log as CSV or TSV text.');
  }
  if (!whole) {
    const cut = Math.max(text.lastIndexOf('\n'), text.lastIndexOf('\r'));
    if (cut > 0) text = text.slice(0, cut + 1);
    // A header and data rows take far less than the sample; a line that fills it is not a log's.
    const breaks = Math.max(countChar(text, '\n'), countChar(text, '\r'));
    if (breaks < 2) {
      throw new ImportError(file, `the line runs on for more than ${SAMPLE_BYTES / 1024} KB without a line break: this is not a log export`, { line: breaks + 1 });
    }
  }
  if (text.trim() === '') throw new ImportError(file, 'the file holds no text (only blanks or line breaks)');
  const ascii = asciiShare(text);
  if (ascii < 0.5) {
    throw new ImportError(
      file,
      `the file does not read as text (only ${Math.round(ascii * 100)} % of its first characters are plain ASCII, where a log is mostly digits and separators): ` +
        'it may be binary, or in an encoding other than UTF-8, UTF-16 or Latin-1. Export the log as CSV or TSV text.',
    );
  }
  return { file, path, bytes: size, encoding: guess.encoding, text, whole, sampleBytes: bytes.length, bomLength: guess.bomLength };
}

/** Share of the first 64 Ki characters of `text` below U+0080 (whitespace included). */
function asciiShare(text: string): number {
  const n = Math.min(text.length, 65536);
  return n === 0 ? 1 : (n - countMatches(text.slice(0, n), NOT_ASCII)) / n;
}

const NOT_ASCII = /[^\x00-\x7f]/g;
