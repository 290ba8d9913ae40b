import { stringify, type Options } from 'csv-stringify';
import { stringify as stringifySync } from 'csv-stringify/sync';

/**
 * The one CSV writer behind every export. Text that a spreadsheet would run as a formula
 * (starting with = + - @, a tab or a carriage return) gets a leading apostrophe, as the OWASP
 * "CSV Injection" guidance advises; numbers stay numbers, so negative values still sort.
 * CRLF line ends (RFC 4180).
 */
const OPTIONS: Options = { escape_formulas: true, record_delimiter: 'windows' };

export const CSV_TYPE = 'text/csv; charset=utf-8';

/** A whole CSV from rows, the first row being the header. */
export function csvText(rows: unknown[][]): string {
  return stringifySync(rows, OPTIONS);
}

/** A streaming writer of objects with these columns (header first). */
export function csvStream(columns: string[]) {
  return stringify({ ...OPTIONS, header: true, columns });
}
