import { Transform, type Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { csvStream } from '../../lib/csv.ts';
import { RAW_EXPORT_COLUMNS, ROLLUP_EXPORT_COLUMNS, type ExportQuery } from '../../../../shared/schemas/export.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import { exportRepository, type ExportProbe } from './export.repository.ts';

/** 'YYYY-MM-DD HH:MM:SS[.mmm]' (UTC, as the raw pool returns it) → ISO 8601 with Z. */
const isoUtc = (sqlTs: string) => `${sqlTs.replace(' ', 'T')}Z`;

/** Swaps the probe id in column 0 for tank and probe tags, and the time for ISO text. */
function labeller(probes: Map<number, ExportProbe>): Transform {
  return new Transform({
    objectMode: true,
    transform(row: unknown[], _enc, done) {
      const p = probes.get(row[0] as number);
      done(null, [p?.tankTag ?? '', p?.probeTag ?? String(row[0]), isoUtc(String(row[1])), ...row.slice(2)]);
    },
  });
}

export type ExportPlan = { probes: ExportProbe[]; fileName: string };

export const exportService = {
  async plan(q: ExportQuery): Promise<ExportPlan> {
    const probes = await exportRepository.probes(q.tankIds);
    const found = new Set(probes.map((p) => p.tankId));
    const missing = q.tankIds.filter((id) => !found.has(id));
    if (missing.length > 0) throw AppError.notFound(`Tank ${missing.join(', ')} (or its probe)`);
    const day = (iso: string) => new Date(iso).toISOString().slice(0, 16).replace(/[-:]/g, '');
    return { probes, fileName: `ferrisight-readings-${q.source}-${day(q.from)}-${day(q.to)}.csv` };
  },

  /**
   * Streams the CSV into `out` row by row: the database stream, the labeller and csv-stringify
   * each hold a few rows, so memory stays flat whatever the range. Formula-like text cells are
   * escaped (escape_formulas); numbers stay numbers, so negative ORP values remain sortable.
   * @returns false when the client went away before the end
   */
  async stream(q: ExportQuery, plan: ExportPlan, out: Writable): Promise<boolean> {
    const { conn, rows } = await exportRepository.open(q.source, plan.probes.map((p) => p.probeId), Date.parse(q.from), Date.parse(q.to));
    const columns = q.source === 'raw' ? [...RAW_EXPORT_COLUMNS] : [...ROLLUP_EXPORT_COLUMNS];
    const csv = csvStream(columns);
    try {
      await pipeline(rows, labeller(new Map(plan.probes.map((p) => [p.probeId, p]))), csv, out);
      await conn.release();
      return true;
    } catch (err) {
      // A half-read result set would block the connection: drop it rather than drain it.
      conn.destroy();
      if ((err as NodeJS.ErrnoException).code === 'ERR_STREAM_PREMATURE_CLOSE') return false;
      logger.error({ err }, 'readings export failed mid-stream');
      throw err;
    }
  },
};
