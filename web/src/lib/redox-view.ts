/**
 * What a screen shows about a tank's band and uncertainty. All chemistry is delegated
 * to shared/redox; this file only picks the inputs from a tank and survives bad data.
 */
import { ratioToOrpMv, ratioUncertainty } from '@shared/redox';
import type { Band, CalibrationInfo, ProbeInfo } from '@shared/schemas/plant';

type Reference = Parameters<typeof ratioToOrpMv>[0]['reference'];

/** The reference electrode values stored on the probe (which may differ from the published table). */
export function referenceOf(probe: ProbeInfo): Reference {
  return {
    id: probe.referenceId,
    label: probe.referenceLabel,
    e25V: probe.referenceE25V,
    coeffVPerK: probe.referenceCoeffVPerK,
    source: 'probe record',
  };
}

export type BandMv = { lowMv: number; highMv: number; targetMv: number | null };

/** The ratio band as probe mV at the given temperature, or null when it cannot be computed. */
export function bandAsMv(
  band: Band,
  probe: ProbeInfo | null,
  calibration: CalibrationInfo | null,
  tempC: number | null | undefined,
): BandMv | null {
  if (!probe || !calibration || tempC == null) return null;
  const at = (ratio: number) =>
    ratioToOrpMv({
      ratio,
      tempC,
      reference: referenceOf(probe),
      formalPotentialV: calibration.formalPotentialV,
      formalCoeffVPerK: calibration.formalCoeffVPerK,
    });
  try {
    return { lowMv: at(band.low), highMv: at(band.high), targetMv: band.target != null ? at(band.target) : null };
  } catch {
    // A RangeError here means bad stored data (e.g. a temperature out of range): show "—", not a crash.
    return null;
  }
}

/** Factor by which the ratio is uncertain given the probe tolerance (ratio ×/÷ factor), or null. */
export function uncertaintyFactor(probe: ProbeInfo | null, tempC: number | null | undefined): number | null {
  if (!probe || tempC == null || !(probe.toleranceMv > 0)) return null;
  try {
    return ratioUncertainty({ tempC, toleranceMv: probe.toleranceMv }).factor;
  } catch {
    return null;
  }
}

export type BandPosition = 'below' | 'in' | 'above';

export function bandPosition(ratio: number, band: Band): BandPosition {
  if (ratio < band.low) return 'below';
  if (ratio > band.high) return 'above';
  return 'in';
}

/** How far outside the band, in decades (0 inside): used to rank the worst tank. */
export function decadesOutside(ratio: number, band: Band): number {
  if (ratio < band.low) return Math.log10(band.low / ratio);
  if (ratio > band.high) return Math.log10(ratio / band.high);
  return 0;
}
