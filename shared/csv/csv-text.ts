/**
 * CSV text for small tables built in the browser (digest tables). Same rules as the API's
 * streamed exports: RFC 4180 quoting, and text cells starting with = + - @ tab or CR get a
 * leading apostrophe so a spreadsheet shows them instead of running them as formulas.
 * Numbers stay numbers: a negative ORP cannot carry a formula and must remain sortable.
 */
export type CsvCell = string | number | null | undefined;

const FORMULA_START = /^[=+\-@\t\r\uFF1D\uFF0B\uFF0D\uFF20]/;

export function csvCell(value: CsvCell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  let text = FORMULA_START.test(value) ? `'${value}` : value;
  if (/[",\r\n]/.test(text)) text = `"${text.replace(/"/g, '""')}"`;
  return text;
}

/** Header plus rows, CRLF line ends (what spreadsheets expect). */
export function toCsv(header: string[], rows: CsvCell[][]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
