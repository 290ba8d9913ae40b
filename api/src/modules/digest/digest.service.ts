import { bandSpansFor } from '../../../../shared/digest/band-spans.ts';
import { sparkline } from '../../../../shared/digest/sparkline.ts';
import { timeInBand } from '../../../../shared/digest/time-in-band.ts';
import type { DigestQuery, DigestResponse, TankDigest } from '../../../../shared/schemas/digest.ts';
import type { ShiftView } from '../../../../shared/schemas/shifts.ts';
import { AppError } from '../../lib/app-error.ts';
import { shiftLogRepository } from '../shifts/shift-log.repository.ts';
import { shiftsRepository } from '../shifts/shifts.repository.ts';
import { resolveShift, shiftView, siteContext, type SiteContext } from '../shifts/site-shifts.ts';
import { alarmDigestRepository } from './alarm-digest.repository.ts';
import { digestEventsRepository, existingTables } from './digest-events.repository.ts';
import { rollupDigestRepository, type TankStats } from './rollup-digest.repository.ts';

const MINUTE_MS = 60_000;
const SPARK_SLOTS = 160;

type Window = { fromMs: number; toMs: number; shift: ShiftView | null; shiftId: number | null };

/** The asked-for shift or range; by default the last closed shift (or the last finished one when none was closed yet). */
async function windowFor(ctx: SiteContext, q: DigestQuery): Promise<Window> {
  if (q.from && q.to) return { fromMs: Date.parse(q.from), toMs: Date.parse(q.to), shift: null, shiftId: null };
  let s;
  if (q.shiftStart) {
    s = await resolveShift(ctx, Date.parse(q.shiftStart));
    if (s.startsAtMs !== Date.parse(q.shiftStart)) throw AppError.badRequest(`No shift starts at ${q.shiftStart}`);
  } else {
    const row = await shiftsRepository.lastClosed(ctx.site.id);
    s = row
      ? { startsAtMs: row.startsAt.getTime(), endsAtMs: row.endsAt.getTime(), row }
      : await resolveShift(ctx, (await resolveShift(ctx, Date.now())).startsAtMs - 1);
  }
  return { fromMs: s.startsAtMs, toMs: s.endsAtMs, shift: shiftView(ctx.site.id, s), shiftId: s.row?.id ?? null };
}

const stat = (mean: number, min: number, max: number) => ({ mean, min, max });

export const digestService = {
  async digest(q: DigestQuery): Promise<DigestResponse> {
    const started = performance.now();
    const ctx = await siteContext(q.siteId);
    const w = await windowFor(ctx, q);
    // Minutes still to come are not "no data": a running shift is told up to now.
    const toMs = Math.min(w.toMs, Math.floor(Date.now() / MINUTE_MS) * MINUTE_MS);
    const fromMs = w.fromMs;
    if (toMs <= fromMs) throw AppError.badRequest('That period has not started yet');
    // Events and log entries count up to this very moment, not just to the last whole minute.
    const eventsToMs = Math.min(w.toMs, Date.now());

    const tables = await existingTables();
    const tanks = await rollupDigestRepository.tanks(ctx.site.id);
    const ids = tanks.map((t) => t.id);
    const range = digestEventsRepository.range(ctx.site.id, ctx.site.timeZone, fromMs, eventsToMs);
    const [stats, minutes, changes, bandChanges, calibrations, assays, probeChecks, alarms, log] = await Promise.all([
      rollupDigestRepository.stats(ids, fromMs, toMs),
      rollupDigestRepository.minutes(ids, fromMs, toMs),
      digestEventsRepository.effectiveBandChanges(tables, ids),
      digestEventsRepository.bandChanges(tables, range),
      digestEventsRepository.calibrations(tables, range),
      digestEventsRepository.assays(tables, range),
      digestEventsRepository.probeChecks(tables, range),
      alarmDigestRepository.figures(tables, ctx.site.id, fromMs, eventsToMs),
      w.shiftId ? shiftLogRepository.ofShift(w.shiftId) : w.shift ? Promise.resolve([]) : shiftLogRepository.between(ctx.site.id, fromMs, eventsToMs),
    ]);
    const byTank = new Map<number, TankStats>(stats.map((s) => [Number(s.tankId), s]));

    const tankDigests = tanks.map((t): TankDigest => {
      const points = minutes.get(t.id) ?? [];
      const spans = bandSpansFor(changes.get(t.id) ?? [], t.band, fromMs, toMs);
      const s = byTank.get(t.id);
      return {
        tankId: t.id, tag: t.tag, name: t.name, circuitTag: t.circuitTag,
        bands: spans.map((b) => ({ from: new Date(b.fromMs).toISOString(), low: b.low, high: b.high })),
        minutes: timeInBand(points, spans, fromMs, toMs),
        ratio: s ? stat(10 ** s.lrMean, 10 ** s.lrMin, 10 ** s.lrMax) : null,
        orpMv: s ? stat(s.orpMean, s.orpMin, s.orpMax) : null,
        tempC: s ? stat(s.tempMean, s.tempMin, s.tempMax) : null,
        spark: sparkline(points, fromMs, toMs, SPARK_SLOTS),
      };
    });
    return {
      site: ctx.site, from: new Date(fromMs).toISOString(), to: new Date(toMs).toISOString(), shift: w.shift,
      tanks: tankDigests, alarms, bandChanges, calibrations, assays, probeChecks, log,
      computedMs: Math.round(performance.now() - started),
    };
  },
};
