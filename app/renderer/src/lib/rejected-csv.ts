/** The Import screen's export of an import's rejected rows as CSV. Pure, so it is unit-tested. */
import type { RejectedRow } from '../../../api/contract.ts';

/** One CSV cell (RFC 4180 quoting: a cell with a quote, comma or line break is quoted, quotes doubled). */
function csvCell(v: string | number | null | undefined): string {
  const s = v === null || v === undefined ? '' : String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The rejected rows of an import as the CSV file the screen exports (CRLF line ends, a header row). */
export function rejectedRowsCsv(rows: readonly RejectedRow[]): string {
  const lines = ['line,column,column_name,reason,row'];
  for (const r of rows) lines.push([r.line, r.column, r.columnName, r.reason, r.raw].map(csvCell).join(','));
  return lines.join('\r\n') + '\r\n';
}
