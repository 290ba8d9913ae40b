import {
  ASSAY_CSV_REQUIRED, parseAssayUnit, toGramsPerLitre, type CsvPreviewRow, type CsvRowError,
} from '../../../../shared/schemas/assays.ts';
import { FUTURE_SKEW_MS } from '../../../../shared/schemas/workbench.ts';
import type { DecodedCsv } from './csv-decode.ts';
import { parseSamplingTime } from './sampling-time.ts';

export type TankRef = { id: number; tag: string; timeZone: string };
export type ValidRow = CsvPreviewRow & { tankId: number; sampledAtMs: number };
export type CheckedRows = { valid: ValidRow[]; errors: CsvRowError[]; decimalComma: boolean };

const LIMITS: Record<string, number> = { method: 80, analyst: 80, lab_ref: 60, note: 500 };
const PLAIN = /^[+-]?(\d+(\.\d*)?|\.\d+)$/;
const COMMA = /^[+-]?\d+,\d+$/;

/**
 * Checks every row and lists every problem by row (the file's line number) and column, so a lab
 * clerk can fix the whole file in one pass. Duplicates of stored assays are added by the caller,
 * which knows the database; duplicates inside the file are found here.
 */
export function checkRows(csv: DecodedCsv, tanks: Map<string, TankRef>, nowMs: number): CheckedRows {
  const errors: CsvRowError[] = [];
  const missing = ASSAY_CSV_REQUIRED.filter((c) => !csv.header.includes(c));
  if (missing.length) {
    for (const column of missing) errors.push({ row: 1, column, value: '', message: `missing column '${column}' in the header line` });
    return { valid: [], errors, decimalComma: false };
  }
  const col = Object.fromEntries(csv.header.map((h, i) => [h, i]));
  const valid: ValidRow[] = [];
  const seen = new Map<string, number>();
  let decimalComma = false;

  for (const { line, cells } of csv.records) {
    const rowErrors: CsvRowError[] = [];
    const fail = (column: string, value: string, message: string) => rowErrors.push({ row: line, column, value, message });
    if (cells.length !== csv.header.length) {
      const hint = csv.delimiter === ',' ? ' (a decimal comma in a comma-separated file? Quote the value or use ";" as delimiter)' : '';
      fail('(row)', cells.join(csv.delimiter), `has ${cells.length} fields but the header has ${csv.header.length}${hint}`);
      errors.push(...rowErrors);
      continue;
    }
    const get = (c: string) => (col[c] === undefined ? '' : (cells[col[c]] ?? '').trim());
    const num = (c: string): number | null => {
      const v = get(c);
      const comma = csv.delimiter !== ',' && COMMA.test(v);
      const text = comma ? v.replace(',', '.') : v;
      const problem = !v ? 'missing value' : !PLAIN.test(text) ? 'not a number' : Number(text) < 0 ? 'cannot be negative' : null;
      if (problem) {
        fail(c, v, problem);
        return null;
      }
      decimalComma ||= comma;
      return Number(text);
    };

    const tagText = get('tank');
    const tank = tanks.get(tagText.toLowerCase());
    if (!tagText) fail('tank', tagText, 'missing value');
    else if (!tank) fail('tank', tagText, `unknown tank '${tagText}'`);

    const timeText = get('sampled_at');
    let sampledAtMs: number | null = null;
    if (!timeText) fail('sampled_at', timeText, 'missing value');
    else {
      const parsed = parseSamplingTime(timeText, tank?.timeZone ?? 'UTC');
      if (typeof parsed === 'string') fail('sampled_at', timeText, parsed);
      else if (parsed > nowMs + FUTURE_SKEW_MS) fail('sampled_at', timeText, 'sampling time is in the future');
      else sampledAtMs = parsed;
    }

    const fe2 = num('fe2');
    const feTotal = num('fe_total');
    if (feTotal === 0) fail('fe_total', get('fe_total'), 'total Fe must be above 0');
    if (fe2 !== null && feTotal !== null && fe2 > feTotal) fail('fe2', get('fe2'), `Fe²⁺ (${fe2}) is above total Fe (${feTotal})`);

    const unitText = get('unit');
    const unit = parseAssayUnit(unitText);
    if (!unitText) fail('unit', unitText, 'missing value');
    else if (!unit) fail('unit', unitText, `unit unknown '${unitText}': use g/L, mg/L or mol/L`);

    for (const [c, max] of Object.entries(LIMITS)) if (get(c).length > max) fail(c, get(c).slice(0, 40), `longer than ${max} characters`);

    if (tank && sampledAtMs !== null) {
      const key = `${tank.id}|${sampledAtMs}`;
      const first = seen.get(key);
      if (first !== undefined) fail('sampled_at', timeText, `same tank and sampling time as row ${first}`);
      else seen.set(key, line);
    }
    if (rowErrors.length || !tank || sampledAtMs === null || fe2 === null || feTotal === null || !unit) {
      errors.push(...rowErrors);
      continue;
    }
    const opt = (c: string) => get(c) || null;
    valid.push({
      row: line, tankId: tank.id, tankTag: tank.tag, sampledAtMs, sampledAt: new Date(sampledAtMs).toISOString(),
      fe2, feTotal, unit, fe2GPerL: toGramsPerLitre(fe2, unit), feTotalGPerL: toGramsPerLitre(feTotal, unit),
      method: opt('method'), analyst: opt('analyst'), labRef: opt('lab_ref'), note: opt('note'),
    });
  }
  return { valid, errors, decimalComma };
}
