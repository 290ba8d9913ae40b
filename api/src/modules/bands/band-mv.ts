import { ratioToOrpMv, type ReferenceElectrode } from '../../../../shared/redox/index.ts';
import type { BandMvView, BandValues } from '../../../../shared/schemas/bands.ts';
import type { ProbeInfo, TankSummary } from '../../../../shared/schemas/plant.ts';

/** The probe's stored reference values (a probe maker's own numbers may differ from the tables). */
export function referenceOfProbe(p: ProbeInfo): ReferenceElectrode {
  return { id: p.referenceId, label: p.referenceLabel, e25V: p.referenceE25V, coeffVPerK: p.referenceCoeffVPerK, source: `probe ${p.tag}` };
}

/**
 * A ratio band as probe mV at the tank's current temperature (operators think in mV).
 * Returns a note instead when a needed input is missing, so the screen can say why.
 */
export function bandAsMv(tank: TankSummary, band: BandValues): { mv: BandMvView | null; note: string | null } {
  if (!tank.probe) return { mv: null, note: 'No active probe on this tank' };
  if (!tank.calibration) return { mv: null, note: 'No calibration for this tank' };
  if (!tank.latest) return { mv: null, note: 'No reading yet, so the tank temperature is unknown' };
  const cond = {
    tempC: tank.latest.tempC,
    reference: referenceOfProbe(tank.probe),
    formalPotentialV: tank.calibration.formalPotentialV,
    formalCoeffVPerK: tank.calibration.formalCoeffVPerK,
  };
  try {
    return {
      mv: {
        lowMv: ratioToOrpMv({ ...cond, ratio: band.low }),
        highMv: ratioToOrpMv({ ...cond, ratio: band.high }),
        targetMv: band.target == null ? null : ratioToOrpMv({ ...cond, ratio: band.target }),
        tempC: cond.tempC,
        referenceLabel: tank.probe.referenceLabel,
        calibrationVersion: tank.calibration.version,
        conditions: cond,
      },
      note: null,
    };
  } catch (err) {
    // Bad stored data (temperature out of range, odd reference values): say so rather than fail the list.
    return { mv: null, note: `Cannot convert: ${(err as Error).message}` };
  }
}

export const sameBand = (a: BandValues, b: BandValues) => a.low === b.low && a.high === b.high && (a.target ?? null) === (b.target ?? null);
