import { csvText } from '../../lib/csv.ts';
import { UniqueConstraintError } from 'sequelize';
import {
  ASSAY_CSV_MAX_ROWS, ASSAY_CSV_OPTIONAL, ASSAY_CSV_REQUIRED, type CsvCommitResult, type CsvPreview, type CsvRowError,
} from '../../../../shared/schemas/assays.ts';
import { Tank } from '../../db/models.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import { writeAudit } from '../audit.repository.ts';
import { decodeCsv } from './csv-decode.ts';
import { checkRows, type ValidRow } from './csv-rows.ts';
import { assaysRepository as repo } from './assays.repository.ts';

const MAX_LISTED_ERRORS = 2000;
const SAMPLE_ROWS = 50;

type Checked = { valid: ValidRow[]; errors: CsvRowError[]; preview: Omit<CsvPreview, 'errors' | 'errorsTruncated' | 'sample' | 'validCount'> };

/** Decodes and checks a whole file, including duplicates of stored assays. */
async function check(buf: Buffer, fileName: string): Promise<Checked> {
  const csv = decodeCsv(buf);
  if (csv.records.length === 0) throw AppError.badRequest('The file has a header line but no rows');
  if (csv.records.length > ASSAY_CSV_MAX_ROWS) throw AppError.badRequest(`At most ${ASSAY_CSV_MAX_ROWS} rows per file (this one has ${csv.records.length}): split it`);
  const rows = checkRows(csv, await repo.tankRefs(), Date.now());
  const stored = await repo.existingKeys(rows.valid);
  const valid: ValidRow[] = [];
  for (const r of rows.valid) {
    if (stored.has(`${r.tankId}|${r.sampledAtMs}`)) {
      rows.errors.push({ row: r.row, column: 'sampled_at', value: r.sampledAt, message: `duplicate of a stored assay for tank ${r.tankTag} at this time` });
    } else valid.push(r);
  }
  rows.errors.sort((a, b) => a.row - b.row);
  return {
    valid, errors: rows.errors,
    preview: { fileName, delimiter: csv.delimiter, decimalComma: rows.decimalComma, bom: csv.bom, rowCount: csv.records.length },
  };
}

export const assayCsvService = {
  async preview(buf: Buffer, fileName: string): Promise<CsvPreview> {
    const t0 = Date.now();
    const c = await check(buf, fileName);
    logger.info({ fileName, rows: c.preview.rowCount, errors: c.errors.length, ms: Date.now() - t0 }, 'assay csv previewed');
    return {
      ...c.preview, validCount: c.valid.length, errors: c.errors.slice(0, MAX_LISTED_ERRORS), errorsTruncated: c.errors.length > MAX_LISTED_ERRORS,
      sample: c.valid.slice(0, SAMPLE_ROWS).map(({ tankId: _t, sampledAtMs: _s, ...rest }) => rest),
    };
  },

  /** All rows or none: any invalid row refuses the whole file, and the insert is one transaction. */
  async commit(buf: Buffer, fileName: string, userId: number): Promise<CsvCommitResult> {
    const c = await check(buf, fileName);
    if (c.errors.length > 0) {
      throw new AppError(400, 'csv-invalid', `${c.errors.length} problem(s) in ${fileName}: nothing was stored`, {
        errors: c.errors.slice(0, MAX_LISTED_ERRORS).map((e) => ({ ...e, path: `row ${e.row}.${e.column}` })),
      });
    }
    const source = `csv:${fileName}`.slice(0, 200);
    try {
      const ids = await Tank.sequelize!.transaction(async (tx) => {
        const made = await repo.insertMany(c.valid.map((r) => ({
          tankId: r.tankId, sampledAt: new Date(r.sampledAtMs), fe2GPerL: r.fe2GPerL, feTotalGPerL: r.feTotalGPerL, unit: r.unit,
          fe2Entered: r.fe2, feTotalEntered: r.feTotal, method: r.method, analyst: r.analyst, labRef: r.labRef, note: r.note,
        })), { source, userId }, tx);
        await writeAudit({
          userId, action: 'assay.import', entity: 'assay', entityId: null,
          after: { fileName, rows: made.length, firstId: made[0], lastId: made[made.length - 1] },
        }, tx);
        return made;
      });
      return { inserted: ids.length, fileName };
    } catch (err) {
      // Someone stored one of these assays between our check and the insert: nothing was kept.
      if (err instanceof UniqueConstraintError) throw AppError.conflict('An assay in this file was stored by someone else meanwhile: preview again');
      throw err;
    }
  },

  /** A template with the columns and two example rows for the first tank of the plant. */
  async template(): Promise<string> {
    const tanks = [...(await repo.tankRefs()).values()].sort((a, b) => a.id - b.id);
    const tag = tanks[0]?.tag ?? 'A1';
    return csvText([
      [...ASSAY_CSV_REQUIRED, ...ASSAY_CSV_OPTIONAL],
      [tag, '2026-12-01 08:30', '1.20', '14.8', 'g/L', 'dichromate titration', 'initials', 'LAB-0001', 'example row: delete before upload'],
      [tag, '2026-12-01T14:30:00+08:00', '1150', '14600', 'mg/L', 'ICP (total Fe)', 'initials', 'LAB-0002', 'times without an offset are site time'],
    ]);
  },
};
