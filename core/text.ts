/** Small text helpers shared by the file readers of core/ (mapping files, schedule files). */

/** 1-based line and column of a character offset in `text` (lines end at '\n'). */
export function lineColumnAt(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}
