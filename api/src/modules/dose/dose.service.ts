import { ratioUncertainty } from '../../../../shared/redox/index.ts';
import type { DoseInputs } from '../../../../shared/schemas/dose.ts';
import { AppError } from '../../lib/app-error.ts';
import { assaysRepository } from '../assays/assays.repository.ts';
import { plantService } from '../plant/plant.service.ts';

/**
 * Gathers what the Dose advisor starts from. The arithmetic runs in the browser with
 * shared/redox, so the metallurgist can change any input and see the steps at once.
 * Advisory only: nothing here talks to the plant.
 */
export const doseService = {
  async inputs(tankId: number): Promise<DoseInputs> {
    const found = await plantService.tank(tankId);
    if (!found) throw AppError.notFound('Tank');
    const t = found.tank;
    const [assay] = await assaysRepository.list({ tankId, liveOnly: true, limit: 1 });
    let uncertaintyFactor: number | null = null;
    if (t.probe && t.latest) {
      try {
        uncertaintyFactor = ratioUncertainty({ tempC: t.latest.tempC, toleranceMv: t.probe.toleranceMv }).factor;
      } catch {
        uncertaintyFactor = null; // out-of-range stored values: the advisor simply shows no uncertainty
      }
    }
    return {
      tankId, tankTag: t.tag, volumeM3: t.volumeM3, band: t.band,
      // The band is drawn on a log scale, so its middle is the geometric mean.
      bandMiddle: Math.sqrt(t.band.low * t.band.high),
      latest: t.latest && { ratio: t.latest.ratio, ts: t.latest.ts, tempC: t.latest.tempC, flag: t.latest.flag },
      latestAssay: assay ? { id: assay.id, sampledAt: assay.sampledAt.toISOString(), feTotalGPerL: assay.feTotalGPerL } : null,
      uncertaintyFactor, circuitProcess: found.circuit.process,
    };
  },
};
