import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useRef } from 'react';
import type { PlantResponse } from '@shared/schemas/plant';
import type { TankLive } from '@shared/schemas/readings';
import { useSocketEvent } from '../../../lib/socket';
import { plantKeys } from '../api/plant-keys';
import type { FreshnessByProbe } from './use-probe-freshness';

/** Replaces each tank's latest with a newer pushed reading; untouched branches keep their identity. */
export function mergeLatest(plant: PlantResponse, readings: TankLive[]): PlantResponse {
  const byTank = new Map(readings.map((r) => [r.tankId, r]));
  let changed = false;
  const sites = plant.sites.map((site) => {
    let siteChanged = false;
    const circuits = site.circuits.map((circuit) => {
      let circuitChanged = false;
      const tanks = circuit.tanks.map((tank) => {
        const next = byTank.get(tank.id);
        if (!next || (tank.latest && tank.latest.ts > next.ts)) return tank;
        circuitChanged = true;
        return { ...tank, latest: next };
      });
      if (!circuitChanged) return circuit;
      siteChanged = true;
      return { ...circuit, tanks };
    });
    if (!siteChanged) return site;
    changed = true;
    return { ...site, circuits };
  });
  return changed ? { ...plant, sites } : plant;
}

/** Writes socket pushes into the plant cache. Mounted once by the app shell, so every screen stays live. */
export function usePlantLiveSync(): void {
  const qc = useQueryClient();
  // Pushes arrive one per site each tick: they are gathered and written once per frame, so a
  // plant of many sites repaints once, not once per site.
  const pending = useRef<TankLive[]>([]);
  const frame = useRef<number | null>(null);
  useEffect(() => () => {
    if (frame.current !== null) cancelAnimationFrame(frame.current);
  }, []);
  useSocketEvent('tank:latest', (readings) => {
    pending.current.push(...readings);
    const write = () => {
      frame.current = null;
      const batch = pending.current;
      pending.current = [];
      qc.setQueryData<PlantResponse>(plantKeys.tree(), (old) => (old ? mergeLatest(old, batch) : old));
    };
    // A hidden tab gets no frames: write at once there (nothing is painted) instead of piling up.
    if (document.hidden) write();
    else frame.current ??= requestAnimationFrame(write);
  });
  useSocketEvent('probe:freshness', (f) => {
    qc.setQueryData<FreshnessByProbe>(plantKeys.freshness(), (old) => ({ ...(old ?? {}), [f.probeId]: f }));
  });
}
