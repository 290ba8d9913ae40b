import fs from 'node:fs';
import { pipeline, Transform } from 'node:stream';
import { parse } from 'csv-parse';
import { CalibrationHistory, convertReadingAt } from '../readings/calibration-history.ts';
import { inTransaction, type Pool } from '../../db/pool.ts';
import type { DecodedReading } from '../readings/decode.ts';
import type { ConvertedReading } from '../readings/convert.ts';
import { ProbeCache } from '../readings/probe-cache.ts';
import { storeReadings, type StoreResult } from '../readings/readings.repository.ts';
import { IMPORT_MAX_KEPT_REJECTIONS, mapImportHeader, type ImportField } from '../../../../shared/schemas/import.ts';
import { importRepository, type JobProgress } from './import.repository.ts';
import { decodeImportRow, rejection, type Rejection } from './import-rows.ts';

const BATCH_ROWS = 5000;
/** Deadlock (1213) or lock wait timeout (1205) against the live ingest worker: retry the batch. */
const RETRYABLE = new Set([1213, 1205]);

export type ImportOptions = { pool: Pool; retentionDays: number; source: string };

async function storeWithRetry(pool: Pool, readings: ConvertedReading[], source: string): Promise<StoreResult> {
  for (let attempt = 0; ; attempt += 1) {
    try {
      return await inTransaction(pool, (conn) => storeReadings(conn, readings, source));
    } catch (err) {
      if (attempt >= 4 || !RETRYABLE.has((err as { errno?: number }).errno ?? 0)) throw err;
      await new Promise((resolve) => setTimeout(resolve, 50 * 2 ** attempt));
    }
  }
}

/**
 * Reads the uploaded file as a stream and stores it in batches through the ingest worker's
 * own store (same duplicate and conflict rules, rollups recomputed in the same transaction),
 * converting each reading with the calibration valid at its time. Each batch commits on its
 * own, so a failure part-way leaves whole batches, and running the file again only adds what
 * is missing.
 */
export async function runImport(jobId: number, filePath: string, o: ImportOptions): Promise<JobProgress> {
  const cache = new ProbeCache(o.pool);
  await cache.reload();
  const history = await CalibrationHistory.load(o.pool);
  const p: JobProgress = { bytesRead: 0, rowsRead: 0, stored: 0, duplicates: 0, conflicts: 0, rejected: 0 };
  let kept = 0;
  let rejected: Rejection[] = [];
  const reject = (r: Rejection) => {
    p.rejected += 1;
    if (kept < IMPORT_MAX_KEPT_REJECTIONS) {
      kept += 1;
      rejected.push(r);
    }
  };

  const counter = new Transform({ transform(chunk: Buffer, _e, done) { p.bytesRead += chunk.length; done(null, chunk); } });
  const parser = parse({
    bom: true, record_delimiter: ['\r\n', '\n', '\r'], relax_quotes: true, relax_column_count: true, skip_empty_lines: true,
    trim: true, info: true, skip_records_with_error: true,
    on_skip: (err) => {
      p.rowsRead += 1;
      reject(rejection((err as { lines?: number } | undefined)?.lines ?? 0, `unreadable CSV: ${err?.message ?? 'bad record'}`, ''));
    },
  });
  // pipeline() destroys every stage on any error, so a read error ends the loop below with it.
  const input = pipeline(fs.createReadStream(filePath), counter, parser, () => undefined);

  let columns: Record<ImportField, number> | null = null;
  let batch: { line: number; reading: DecodedReading }[] = [];
  const flush = async () => {
    const receivedAtMs = Date.now();
    const converted: ConvertedReading[] = [];
    for (const { line, reading } of batch) {
      const out = convertReadingAt(reading, cache, history, { receivedAtMs, retentionDays: o.retentionDays });
      if (typeof out === 'string') reject(rejection(line, out, [reading.probeTag, reading.ts, String(reading.orpMv), String(reading.tempC)]));
      else converted.push({ ...out, seq: null });
    }
    batch = [];
    const res = await storeWithRetry(o.pool, converted, o.source);
    p.stored += res.stored;
    p.duplicates += res.duplicates;
    p.conflicts += res.conflicts;
    if (rejected.length > 0) await importRepository.addRejections(jobId, rejected);
    rejected = [];
    await importRepository.progress(jobId, p);
  };

  for await (const { record, info } of input as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
    if (!columns) {
      const mapped = mapImportHeader(record);
      if ('missing' in mapped) {
        input.destroy();
        throw new Error(`The first line must name the columns; missing: ${mapped.missing.join(', ')} (expected e.g. probe,time,orp_mv,temp_c)`);
      }
      columns = mapped.columns;
      continue;
    }
    p.rowsRead += 1;
    const decoded = decodeImportRow(record, columns, cache);
    if (typeof decoded === 'string') reject(rejection(info.lines, decoded, record));
    else batch.push({ line: info.lines, reading: decoded });
    if (batch.length >= BATCH_ROWS) await flush();
  }
  if (!columns) throw new Error('The file is empty');
  await flush();
  return p;
}
