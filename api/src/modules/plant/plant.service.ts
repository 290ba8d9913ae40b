import type { CircuitProcess, RecentReading, SiteSummary, TankSummary, TrendQuery, TrendResponse } from '../../../../shared/schemas/plant.ts';
import { AppError } from '../../lib/app-error.ts';
import { plantRepository } from './plant.repository.ts';
import { queryTrend } from './trend.repository.ts';
import { onReadReplica } from '../../cluster/read-db.ts';

export const plantService = {
  tree: () => plantRepository.tree(),

  async tank(id: number): Promise<{
    tank: TankSummary; site: Omit<SiteSummary, 'circuits'>; circuit: { id: number; tag: string; name: string; process: CircuitProcess }; recent: RecentReading[];
  } | null> {
    for (const s of await plantRepository.tree()) {
      for (const c of s.circuits) {
        const tank = c.tanks.find((t) => t.id === id);
        if (!tank) continue;
        const recent = tank.probe ? await plantRepository.recentReadings(tank.probe.id, 10) : [];
        return { tank, site: { id: s.id, tag: s.tag, name: s.name, timeZone: s.timeZone }, circuit: { id: c.id, tag: c.tag, name: c.name, process: c.process }, recent };
      }
    }
    return null;
  },

  async trend(tankId: number, q: TrendQuery): Promise<TrendResponse> {
    const probe = await plantRepository.probeOfTank(tankId);
    if (!probe) throw AppError.notFound('Tank or its probe');
    // Trends may come from the read replica (DATABASE_READ_URL, README "Scaling out").
    const result = await onReadReplica((db) => queryTrend(db, probe.id, new Date(q.from), new Date(q.to), q.maxPoints, probe.intervalS));
    return { tankId, ...result };
  },
};
