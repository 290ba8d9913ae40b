import type { Sequelize } from 'sequelize';
import { AuditEntry } from '../../api/src/db/models.ts';
import type { ReferenceElectrode } from '../../shared/redox/index.ts';
import type { DemoPeople } from './demo-people.ts';
import type { DemoStory } from './demo-story.ts';
import type { HistoryPoint } from './history-model.ts';

/** Everything the parts of the demo week share. */
export type DemoContext = {
  sequelize: Sequelize;
  story: DemoStory;
  siteId: number;
  timeZone: string;
  people: DemoPeople;
  tanks: Map<string, { id: number; circuitTag: string }>;
  probes: Map<string, { id: number; tankTag: string; reference: ReferenceElectrode; toleranceMv: number }>;
  /** The generated minutes per tank tag. */
  points: Map<string, HistoryPoint[]>;
};

/** The point of a tank's history at a whole minute, or undefined in a gap. */
export function pointAt(ctx: DemoContext, tankTag: string, tMs: number): HistoryPoint | undefined {
  const pts = ctx.points.get(tankTag) ?? [];
  const guess = Math.round((tMs - ctx.story.startMs) / 60_000);
  for (let i = Math.min(guess, pts.length - 1); i >= 0 && pts[i].tsMs >= tMs - 60_000; i -= 1) {
    if (pts[i].tsMs === Math.floor(tMs / 60_000) * 60_000) return pts[i];
  }
  return undefined;
}

/** An audit entry dated when it happened (the audit repository stamps "now"). */
export async function auditAt(at: number, userId: number, action: string, entity: string, entityId: number | string, after: unknown, reason: string | null = null, before: unknown = null): Promise<void> {
  await AuditEntry.create({ at: new Date(at), userId, action, entity, entityId: String(entityId), beforeJson: before, afterJson: after, reason });
}
