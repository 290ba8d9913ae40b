import { describe, expect, it } from 'vitest';
import { CalibrationHistory, convertReadingAt } from '../../api/src/modules/readings/calibration-history.ts';
import { buildLookup } from '../../api/src/modules/readings/probe-cache.ts';

const T = Date.UTC(2026, 10, 1);
const history = CalibrationHistory.fromRows([
  { tankId: 1, version: 2, formalPotentialV: 0.70, formalCoeffVPerK: 0, validFromMs: T + 10 * 86_400_000 },
  { tankId: 1, version: 1, formalPotentialV: 0.68, formalCoeffVPerK: 0, validFromMs: T },
  { tankId: 1, version: 3, formalPotentialV: 0.69, formalCoeffVPerK: 0, validFromMs: T + 10 * 86_400_000 },
]);

describe('calibration valid at a reading’s time', () => {
  it('when a time falls between calibrations, then the latest one valid by then applies; a tie goes to the higher version', () => {
    expect(history.at(1, T - 1)).toBeNull();
    expect(history.at(1, T)?.version).toBe(1);
    expect(history.at(1, T + 5 * 86_400_000)?.version).toBe(1);
    expect(history.at(1, T + 10 * 86_400_000)?.version).toBe(3);
    expect(history.at(2, T)).toBeNull();
  });

  it('when a reading is converted, then the live rules still apply and only the calibration differs', () => {
    const lookup = buildLookup([{
      probe_id: 7, probe_tag: 'P7', tank_id: 1, site_tag: 's', reference_id: 'agcl-3m', reference_e25_v: 0.21, reference_coeff_v_per_k: -0.0007,
      version: 3, formal_potential_v: 0.69, formal_coeff_v_per_k: 0,
    }], ['s']);
    const opts = { receivedAtMs: T + 20 * 86_400_000, retentionDays: 90 };
    const at = (ms: number) => ({ siteTag: 's', probeTag: 'P7', ts: new Date(ms).toISOString(), orpMv: 450, tempC: 40, seq: 0, index: null });
    const early = convertReadingAt(at(T + 86_400_000), lookup, history, opts);
    const late = convertReadingAt(at(T + 11 * 86_400_000), lookup, history, opts);
    expect(typeof early !== 'string' && early.calibrationVersion).toBe(1);
    expect(typeof late !== 'string' && late.calibrationVersion).toBe(3);
    expect(convertReadingAt(at(T - 1000), lookup, history, opts)).toMatch(/no calibration of tank 1 was valid/);
    expect(convertReadingAt({ ...at(T), probeTag: 'NOPE' }, lookup, history, opts)).toMatch(/unknown probe/);
    expect(convertReadingAt(at(T + 21 * 86_400_000), lookup, history, opts)).toMatch(/in the future/);
  });
});
