import { stringify } from 'csv-stringify/browser/esm/sync';

/**
 * CSV for tables the page already holds (digest tables), written by the same package and with
 * the same options as the API's exports: RFC 4180 quoting, CRLF line ends, and text starting
 * like a spreadsheet formula gets a leading apostrophe. Numbers stay numbers, so a negative
 * ORP stays sortable.
 */
export type CsvCell = string | number | null | undefined;

export function toCsv(header: string[], rows: CsvCell[][]): string {
  const cell = (v: CsvCell) => (typeof v === 'number' && !Number.isFinite(v) ? '' : (v ?? ''));
  return stringify([header, ...rows.map((r) => r.map(cell))], { escape_formulas: true, record_delimiter: 'windows' });
}
