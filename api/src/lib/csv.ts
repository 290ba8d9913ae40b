import { Transform, type Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { stringify, type Options } from 'csv-stringify';
import { stringify as stringifySync } from 'csv-stringify/sync';
import type { Response } from 'express';
import type { PoolConnection } from '../db/pool.ts';
import { logger } from './logger.ts';

/**
 * The one CSV writer behind every export. Text that a spreadsheet would run as a formula
 * (starting with = + - @, a tab or a carriage return) gets a leading apostrophe, as the OWASP
 * "CSV Injection" guidance advises; numbers stay numbers, so negative values still sort.
 * CRLF line ends (RFC 4180).
 */
const OPTIONS: Options = { escape_formulas: true, record_delimiter: 'windows' };

export const CSV_TYPE = 'text/csv; charset=utf-8';

/**
 * A whole CSV from rows, the first row being the header. `bom` starts it with a byte-order
 * mark, so spreadsheet programs read text such as Fe²⁺ or 8–25 as UTF-8.
 */
export function csvText(rows: unknown[][], opts: { bom?: boolean } = {}): string {
  return stringifySync(rows, { ...OPTIONS, bom: opts.bom ?? false });
}

/** A streaming writer of objects with these columns (header first). */
export function csvStream(columns: string[]) {
  return stringify({ ...OPTIONS, header: true, columns });
}

/** Starts a CSV download: file name, type, and no caching of what may be sensitive. */
export function csvAttachment(res: Response, fileName: string): void {
  res.status(200).attachment(fileName).type(CSV_TYPE);
  res.setHeader('Cache-Control', 'no-store');
}

/** A CSV download read row by row: its file name, columns, a row stream on a dedicated connection, and how a database row becomes cells. */
export type CsvExport = {
  fileName: string;
  columns: readonly string[];
  source: { conn: PoolConnection; rows: Readable };
  shape?: (row: unknown[]) => unknown[];
};

/**
 * Streams an export as a CSV download, a few rows in memory at a time. The connection is
 * released at the end, or dropped when the client goes away or the query fails (a half-read
 * result set would block it); once the first bytes left, a failure cuts the response so the
 * file is visibly incomplete.
 */
export async function sendCsvRows(res: Response, x: CsvExport): Promise<void> {
  csvAttachment(res, x.fileName);
  const shape = x.shape ?? ((row: unknown[]) => row);
  const shaper = new Transform({ objectMode: true, transform: (row: unknown[], _enc, done) => done(null, shape(row)) });
  try {
    await pipeline(x.source.rows, shaper, csvStream([...x.columns]), res);
    await x.source.conn.release();
  } catch (err) {
    x.source.conn.destroy();
    if ((err as NodeJS.ErrnoException).code !== 'ERR_STREAM_PREMATURE_CLOSE') logger.error({ err, fileName: x.fileName }, 'CSV export failed mid-stream');
    res.destroy();
  }
}

/** 'YYYY-MM-DD HH:MM:SS[.mmm]' (UTC, as the raw pool returns DATETIME) → ISO 8601 with Z. */
export const isoFromSql = (sqlTs: unknown): string => (sqlTs == null || sqlTs === '' ? '' : `${String(sqlTs).replace(' ', 'T')}Z`);
