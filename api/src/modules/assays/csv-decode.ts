import { parse } from 'csv-parse/sync';
import { AppError } from '../../lib/app-error.ts';

export type Delimiter = ',' | ';' | '\t';
export type CsvRecord = { line: number; cells: string[] };
export type DecodedCsv = { header: string[]; records: CsvRecord[]; delimiter: Delimiter; bom: boolean };

const refuse = (message: string) => new AppError(400, 'csv-unreadable', message);

/**
 * Bytes → text. Only UTF-8 is accepted: guessing between Windows-1252 and Latin-1 would silently
 * turn "µ" or "°" into something else, so any other encoding is refused with what to do instead.
 */
function toText(buf: Buffer): { text: string; bom: boolean } {
  if ((buf[0] === 0xff && buf[1] === 0xfe) || (buf[0] === 0xfe && buf[1] === 0xff)) {
    throw refuse('The file is UTF-16 encoded. Save it as "CSV UTF-8" (or plain CSV in UTF-8) and upload it again.');
  }
  const bom = buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf;
  const body = bom ? buf.subarray(3) : buf;
  if (body.includes(0)) throw refuse('This is not a text file (it contains NUL bytes). Export the sheet as CSV and upload that.');
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(body), bom };
  } catch {
    throw refuse('The file is not valid UTF-8 (perhaps Windows-1252 or Latin-1). Save it as "CSV UTF-8" and upload it again.');
  }
}

/** Picks the delimiter that occurs most often in the header line, outside quotes. */
export function detectDelimiter(headerLine: string): Delimiter {
  const counts: Record<Delimiter, number> = { ',': 0, ';': 0, '\t': 0 };
  let quoted = false;
  for (const ch of headerLine) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch in counts) counts[ch as Delimiter]++;
  }
  const best = (Object.keys(counts) as Delimiter[]).sort((a, b) => counts[b] - counts[a])[0];
  return counts[best] > 0 ? best : ',';
}

/** Normalises a header cell: "Sampled at" → "sampled_at", "Fe2+" → "fe2", "Total Fe" → "fe_total". */
export function headerKey(cell: string): string {
  const k = cell.trim().toLowerCase().replace(/²/g, '2').replace(/[⁺+]/g, '').replace(/[\s\-/]+/g, '_').replace(/[()]/g, '');
  const aliases: Record<string, string> = {
    tank_tag: 'tank', sampling_time: 'sampled_at', sampled: 'sampled_at', time: 'sampled_at',
    total_fe: 'fe_total', fet: 'fe_total', fe_tot: 'fe_total', lab_reference: 'lab_ref', labref: 'lab_ref',
  };
  return aliases[k] ?? k;
}

export function decodeCsv(buf: Buffer): DecodedCsv {
  const { text, bom } = toText(buf);
  const firstLine = text.split(/\r?\n/, 1)[0] ?? '';
  if (!firstLine.trim()) throw refuse('The file is empty or its first line is blank: the first line must name the columns.');
  const delimiter = detectDelimiter(firstLine);
  let rows: Array<{ record: string[]; info: { lines: number } }>;
  try {
    rows = parse(text, { delimiter, info: true, skip_empty_lines: true, relax_column_count: true, trim: true }) as unknown as typeof rows;
  } catch (err) {
    const e = err as Error & { lines?: number };
    throw refuse(`The CSV cannot be read${e.lines ? ` at line ${e.lines}` : ''}: ${e.message}`);
  }
  const [head, ...rest] = rows;
  return {
    header: head.record.map(headerKey),
    records: rest.map((r) => ({ line: r.info.lines, cells: r.record })),
    delimiter,
    bom,
  };
}
