/**
 * Reading a schedule file's text (no I/O: the caller reads the file). Strict JSON; syntax errors and
 * schema errors both name the file, line and column (1-based), and schema errors the key.
 */
import { findNodeAtLocation, parseTree, printParseErrorCode, type Node, type ParseError } from 'jsonc-parser';
import { lineColumnAt } from '../text.ts';
import { parseSchedule, ScheduleError, type WeeklySchedule } from './schedule.ts';

const SYNTAX_HINTS: Record<string, string> = {
  InvalidSymbol: 'unexpected character',
  InvalidNumberFormat: 'malformed number',
  PropertyNameExpected: 'expected a key in double quotes',
  ValueExpected: 'expected a value',
  ColonExpected: 'expected ":"',
  CommaExpected: 'expected ","',
  CloseBraceExpected: 'expected "}"',
  CloseBracketExpected: 'expected "]"',
  EndOfFileExpected: 'unexpected text after the end of the JSON value',
  InvalidCommentToken: 'comments are not allowed in JSON',
  UnexpectedEndOfComment: 'comments are not allowed in JSON',
  UnexpectedEndOfString: 'unterminated string',
  UnexpectedEndOfNumber: 'unterminated number',
  InvalidUnicode: 'invalid \\u escape',
  InvalidEscapeCharacter: 'invalid escape character',
  InvalidCharacter: 'invalid character in a string',
};

/**
 * Parses and validates the text of a schedule file (our JSON format, see schedule.ts).
 *
 * @param text the file's content
 * @param file the file name to put in messages
 * @throws ScheduleError with file, line and column: for a JSON syntax error (key ''), or for a
 *         schema error (the key named, located at the offending value, or at its parent object when the key is missing)
 * @example parseScheduleText('{"name":"A","units":"C","days":{"everyday":[]},"unoccupied":{"heat":16}}', 'a.json')
 */
export function parseScheduleText(text: string, file: string): WeeklySchedule {
  const errors: ParseError[] = [];
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text; // tolerate a UTF-8 byte order mark
  const shift = body === text ? 0 : 1;
  const root = parseTree(body, errors, { disallowComments: true, allowTrailingComma: false, allowEmptyContent: false });
  if (errors.length > 0 || root === undefined) {
    const e = errors[0];
    const at = lineColumnAt(text, (e?.offset ?? 0) + shift);
    const code = e ? printParseErrorCode(e.error) : 'ValueExpected';
    throw new ScheduleError('', `not valid JSON: ${SYNTAX_HINTS[code] ?? code}`, { file, ...at });
  }
  let value: unknown;
  try {
    value = JSON.parse(body);
  } catch (err) {
    throw new ScheduleError('', `not valid JSON: ${(err as Error).message}`, { file });
  }
  const locate = (path: ReadonlyArray<PropertyKey>, atKey: boolean) => {
    // The deepest node on the path that exists: the value itself, else its nearest parent.
    for (let n = path.length; n >= 0; n--) {
      const node: Node | undefined = findNodeAtLocation(root, path.slice(0, n).map((p) => (typeof p === 'number' ? p : String(p))));
      if (node) {
        // For an unknown key, point at the key itself rather than its value.
        const target = atKey && n === path.length && node.parent?.type === 'property' ? node.parent : node;
        return lineColumnAt(text, target.offset + shift);
      }
    }
    return undefined;
  };
  return parseSchedule(value, { file, locate });
}
