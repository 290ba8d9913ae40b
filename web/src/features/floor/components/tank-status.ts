import type { TankSummary } from '@shared/schemas/plant';
import type { ProbeFreshness } from '@shared/schemas/socket-events';
import { freshnessOf, type FreshnessView } from '../../../lib/freshness';
import {
  bandAsMv,
  bandPosition,
  decadesOutside,
  uncertaintyFactor,
  type BandMv,
  type BandPosition,
} from '../../../lib/redox-view';

export type TankStatus = {
  /** offline: out of service; no-probe / no-reading: nothing to show; stale: a value, but too old to trust. */
  kind: 'offline' | 'no-probe' | 'no-reading' | 'stale' | 'live';
  position: BandPosition | null;
  freshness: FreshnessView;
  factor: number | null;
  bandMv: BandMv | null;
  outsideRange: boolean;
  /** The probe failed its last check: its readings are not to be trusted until it passes or is replaced. */
  probeSuspect: boolean;
  /** Decades outside the band (0 inside or when not live). */
  decadesOut: number;
};

export function tankStatus(tank: TankSummary, nowMs: number, server?: ProbeFreshness): TankStatus {
  const latest = tank.latest;
  const freshness = tank.probe
    ? freshnessOf(latest?.ts, tank.probe.intervalS, nowMs, server?.probeId === tank.probe.id ? server : undefined)
    : { ageS: null, stale: true };
  const base = {
    freshness,
    factor: uncertaintyFactor(tank.probe, latest?.tempC),
    bandMv: bandAsMv(tank.band, tank.probe, tank.calibration, latest?.tempC),
    outsideRange: latest?.flag === 'outside-range',
    probeSuspect: latest?.flag === 'probe-suspect',
  };
  if (tank.offline) return { ...base, kind: 'offline', position: null, decadesOut: 0 };
  if (!tank.probe) return { ...base, kind: 'no-probe', position: null, decadesOut: 0 };
  if (!latest) return { ...base, kind: 'no-reading', position: null, decadesOut: 0 };
  if (freshness.stale) return { ...base, kind: 'stale', position: bandPosition(latest.ratio, tank.band), decadesOut: 0 };
  return {
    ...base,
    kind: 'live',
    position: bandPosition(latest.ratio, tank.band),
    decadesOut: decadesOutside(latest.ratio, tank.band),
  };
}
