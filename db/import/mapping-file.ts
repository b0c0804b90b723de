/**
 * Reading a column mapping from a JSON file (the mapping itself is core/mapping.ts).
 */
import { readFile } from 'node:fs/promises';
import { readFileSync } from 'node:fs';
import { basename } from 'node:path';
import { MappingError, parseMappingJson, type ColumnMapping } from '../../core/mapping.ts';

function readFailed(path: string, err: unknown): MappingError {
  const code = (err as NodeJS.ErrnoException).code;
  const name = basename(path);
  return new MappingError(name, code === 'ENOENT' ? `${name}: the mapping file does not exist (${path})` : `${name}: cannot read the mapping file (${(err as Error).message})`);
}

/**
 * Reads and validates a mapping file. Throws MappingError naming the file and the bad key, or the line
 * and column of a JSON syntax error.
 *
 * @example const mapping = await readMappingFile('berlin-export.json');
 */
export async function readMappingFile(path: string): Promise<ColumnMapping> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    throw readFailed(path, err);
  }
  return parseMappingJson(text, basename(path));
}

/** The same, synchronous (for command-line option parsing). */
export function readMappingFileSync(path: string): ColumnMapping {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    throw readFailed(path, err);
  }
  return parseMappingJson(text, basename(path));
}
