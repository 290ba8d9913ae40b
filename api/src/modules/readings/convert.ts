import { orpToRatio, type ReadingFlag } from '../../../../shared/redox/index.ts';
import { MAX_FUTURE_SKEW_MS, type ConvertedReading } from '../../../../shared/schemas/readings.ts';
import { decodeMessage, type Decoded, type DecodedReading, type Rejection } from './decode.ts';
import type { ProbeLookup } from './probe-cache.ts';
import { parseIsoTs } from '../../db/timestamps.ts';

/** A converted reading, ready for storeReadings. */
export type { ConvertedReading };

export type PipelineOptions = { receivedAtMs: number; retentionDays: number };
export type PipelineResult = { readings: ConvertedReading[]; rejections: Rejection[] };

const DAY_MS = 86_400_000;

/** A failed probe check outranks an extrapolated reference but not a ratio out of range or an unusable reference. */
function flagOf(chemistry: ReadingFlag, suspect: boolean): ReadingFlag {
  return suspect && (chemistry === 'ok' || chemistry === 'reference-extrapolated') ? 'probe-suspect' : chemistry;
}

/**
 * Checks one decoded reading against the plant (site, probe ownership, calibration) and the
 * clock, then converts it with shared/redox. Returns a reason string when it must be refused.
 */
export function convertReading(r: DecodedReading, lookup: ProbeLookup, opts: PipelineOptions): ConvertedReading | string {
  const at = r.index === null ? '' : `readings[${r.index}]: `;
  if (!lookup.hasSite(r.siteTag)) return `${at}unknown site '${r.siteTag}'`;
  const probe = lookup.probe(r.probeTag);
  if (!probe) return `${at}unknown probe '${r.probeTag}'`;
  if (probe.siteTag !== r.siteTag) return `${at}probe '${r.probeTag}' does not belong to site '${r.siteTag}'`;
  const tsMs = parseIsoTs(r.ts);
  if (!Number.isFinite(tsMs)) return `${at}ts is not a valid date`;
  if (tsMs > opts.receivedAtMs + MAX_FUTURE_SKEW_MS) {
    return `${at}ts ${r.ts} is more than ${MAX_FUTURE_SKEW_MS / 1000} s in the future`;
  }
  if (tsMs < opts.receivedAtMs - opts.retentionDays * DAY_MS) {
    return `${at}ts ${r.ts} is older than the raw retention window (${opts.retentionDays} days)`;
  }
  const cal = lookup.calibrationAt?.(probe.tankId, tsMs) ?? probe.calibration;
  if (!cal) return `${at}no calibration for tank ${probe.tankId} (probe '${r.probeTag}')`;
  try {
    const out = orpToRatio({
      orpMv: r.orpMv, tempC: r.tempC, reference: probe.reference,
      formalPotentialV: cal.formalPotentialV, formalCoeffVPerK: cal.formalCoeffVPerK, slopeEfficiency: cal.slopeEfficiency,
    });
    return {
      probeId: probe.probeId, tankId: probe.tankId, probeTag: probe.probeTag, siteTag: probe.siteTag,
      tsMs, seq: r.seq, orpMv: r.orpMv, tempC: r.tempC,
      ehV: out.ehV, ratio: out.ratio, ferricFraction: out.ferricFraction, flag: flagOf(out.flag, probe.suspect),
      calibrationVersion: cal.version, receivedAtMs: opts.receivedAtMs,
    };
  } catch (err) {
    // A bad stored reference or calibration must not crash the worker: quarantine instead.
    return `${at}conversion failed: ${(err as Error).message}`;
  }
}

/** Topic + bytes → converted readings and rejections (each becomes a dead letter). Never throws. */
export function processMessage(topic: string, payload: Buffer, lookup: ProbeLookup, opts: PipelineOptions): PipelineResult {
  return processDecoded(decodeMessage(topic, payload), payload, lookup, opts);
}

/** Second half of processMessage, for callers that decoded first (to reload the probe cache). */
export function processDecoded(decoded: Decoded, payload: Buffer, lookup: ProbeLookup, opts: PipelineOptions): PipelineResult {
  const result: PipelineResult = { readings: [], rejections: [...decoded.rejections] };
  for (const r of decoded.readings) {
    const out = convertReading(r, lookup, opts);
    if (typeof out !== 'string') {
      result.readings.push(out);
      continue;
    }
    // In a batch, quarantine just the refused element so it can be replayed on its own.
    const body = r.index === null ? payload
      : Buffer.from(JSON.stringify({ probe: r.probeTag, ts: r.ts, orpMv: r.orpMv, tempC: r.tempC, seq: r.seq }));
    result.rejections.push({ reason: out, payload: body });
  }
  return result;
}
