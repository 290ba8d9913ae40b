import { orpToRatio } from '../../../../shared/redox/index.ts';
import { fromSqlTs, inTransaction, toSqlTs, type Pool } from '../../db/pool.ts';
import { AppError } from '../../lib/app-error.ts';
import { writeAuditOn, type AuditInput } from '../audit.repository.ts';
import { lockReadingsPage, rewriteConversions, type ReadingRow } from '../readings/readings.repository.ts';
import { recomputeRollups } from '../readings/rollups.repository.ts';
import type { ProbeRef } from './calibration.repository.ts';

type Cal = { version: number; formalPotentialV: number; formalCoeffVPerK: number; slopeEfficiency: number };

const PAGE = 5000;
const MINUTE_MS = 60_000;

/**
 * Re-converts a tank's stored readings in [from, to) with one calibration version, in one
 * transaction with its audit entry (`audit` gets the count). Rows are locked page by page
 * before being rewritten, so the retention purge cannot delete one in between and the rewrite
 * never adds a row. The 1 m / 1 h rollups are rebuilt with the ingest worker's own code, so
 * both stay identical.
 */
export async function recomputeReadings(
  pool: Pool, probes: ProbeRef[], cal: Cal, fromMs: number, toMs: number, audit: (updated: number) => AuditInput,
): Promise<number> {
  return inTransaction(pool, async (conn) => {
    let updated = 0;
    for (const probe of probes) {
      let after = toSqlTs(fromMs);
      let afterExclusive = false;
      for (;;) {
        const page = await lockReadingsPage(conn, probe.id, after, afterExclusive, toSqlTs(toMs), PAGE);
        if (page.length === 0) break;
        const rows: ReadingRow[] = page.map((r) => {
          let out: ReturnType<typeof orpToRatio>;
          try {
            out = orpToRatio({ orpMv: r.orpMv, tempC: r.tempC, reference: probe.reference, formalPotentialV: cal.formalPotentialV, formalCoeffVPerK: cal.formalCoeffVPerK, slopeEfficiency: cal.slopeEfficiency });
          } catch (err) {
            throw AppError.badRequest(`Reading of ${probe.tag} at ${r.ts} cannot be converted: ${(err as Error).message}. Nothing was changed.`);
          }
          return {
            probeId: r.probeId, tsMs: fromSqlTs(r.ts), seq: r.seq, orpMv: r.orpMv, tempC: r.tempC, ehV: out.ehV, ratio: out.ratio,
            ferricFraction: out.ferricFraction, flag: out.flag, calibrationVersion: cal.version, receivedAtMs: fromSqlTs(r.receivedAt),
          };
        });
        await rewriteConversions(conn, rows);
        updated += page.length;
        after = page[page.length - 1].ts;
        afterExclusive = true;
        if (page.length < PAGE) break;
      }
    }
    // One point per minute is enough for the rollup code to find every touched bucket.
    const points: { probeId: number; tsMs: number }[] = [];
    for (const probe of probes) {
      for (let t = Math.floor(fromMs / MINUTE_MS) * MINUTE_MS; t < toMs; t += MINUTE_MS) points.push({ probeId: probe.id, tsMs: t });
    }
    if (updated > 0) await recomputeRollups(conn, points);
    await writeAuditOn(conn, audit(updated));
    return updated;
  });
}
