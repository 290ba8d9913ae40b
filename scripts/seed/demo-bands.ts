/**
 * The band change record of the demo week: Train A's upper limit raised (changed on A1, copied
 * to A2–A6), B4's band capped, and a request to widen A3 after the feed upset that a second
 * person turned down. The tanks were seeded with the bands in force now; this writes how they
 * got there, so the digest's time in band and the alarm replay use the band of the time.
 */
import { BandChangeRow, BandDecisionRow } from '../../api/src/db/workbench-models.ts';
import type { BandValues } from '../../shared/schemas/bands.ts';
import { auditAt, type DemoContext } from './demo-context.ts';
import { crewAt } from './demo-people.ts';
import { MINUTE_MS, type DemoStory } from './demo-story.ts';

type Applied = { tankTag: string; atMs: number; old: BandValues; next: BandValues; reason: string; copiedFrom?: string };

const TRAIN_A_REASON = 'Inoculum KF-7 holds ratio 25 without jarosite in the A-train discharge (lab test LT-0412): upper limit up, target to 14';
const B4_REASON = 'B4 residue shows passivation above ratio 2 at 85 °C (SEM report KF-R-118): cap the band at 2';

export function appliedBandChanges(story: DemoStory): Applied[] {
  const a = story.bandChanges.trainAMs;
  return [
    ...[1, 2, 3, 4, 5, 6].map((i): Applied => ({
      tankTag: `A${i}`, atMs: a + (i === 1 ? 0 : 4 * MINUTE_MS), old: { low: 8, high: 20, target: 12 }, next: { low: 8, high: 25, target: 14 },
      reason: TRAIN_A_REASON, copiedFrom: i === 1 ? undefined : 'A1',
    })),
    { tankTag: 'B4', atMs: story.bandChanges.b4Ms, old: { low: 0.5, high: 2.5, target: 1.1 }, next: { low: 0.5, high: 2, target: 1 }, reason: B4_REASON },
  ];
}

/** The band in force for a tank at a time, given its band now. */
export function bandAtFor(changes: Applied[], tankTag: string, tMs: number, current: { low: number; high: number }): { low: number; high: number } {
  const mine = changes.filter((c) => c.tankTag === tankTag).sort((x, y) => x.atMs - y.atMs);
  const before = mine.filter((c) => c.atMs <= tMs);
  if (before.length) return before[before.length - 1].next;
  return mine[0]?.old ?? current;
}

export async function seedBandChanges(ctx: DemoContext): Promise<void> {
  const who = ctx.people.metallurgist.id;
  for (const c of appliedBandChanges(ctx.story)) {
    const tankId = ctx.tanks.get(c.tankTag)!.id;
    const row = await BandChangeRow.create({
      tankId, oldLow: c.old.low, oldHigh: c.old.high, oldTarget: c.old.target, newLow: c.next.low, newHigh: c.next.high, newTarget: c.next.target,
      reason: c.reason, requestedBy: who, requestedAt: new Date(c.atMs), needsApproval: false,
      copiedFromTankId: c.copiedFrom ? ctx.tanks.get(c.copiedFrom)!.id : null,
    });
    await auditAt(c.atMs, who, 'band.change', 'tank', tankId, { ...c.next, changeId: row.id }, c.reason, c.old);
  }
  // Widening A3's low limit from 8 to 3 is more than the approval factor: it waits for a second person.
  const atMs = ctx.story.bandChanges.a3RequestMs;
  const a3 = ctx.tanks.get(ctx.story.upset.tankTag)!.id;
  const old = { low: 8, high: 25, target: 14 };
  const next = { low: 3, high: 25, target: 14 };
  const reason = 'Regrind feed surges expected through the mill reline this week: widen the A3 low limit so the P1 does not flood the desk';
  const req = await BandChangeRow.create({
    tankId: a3, oldLow: old.low, oldHigh: old.high, oldTarget: old.target, newLow: next.low, newHigh: next.high, newTarget: next.target,
    reason, requestedBy: who, requestedAt: new Date(atMs), needsApproval: true, copiedFromTankId: null,
  });
  await auditAt(atMs, who, 'band.request', 'tank', a3, { ...next, changeId: req.id }, reason, old);
  const decidedAt = atMs + 55 * MINUTE_MS;
  const note = 'The band is the process limit, not an alarm setting. Fix the surge at the regrind thickener; shelve with a reason if it floods.';
  const { supervisor } = crewAt(ctx.people, decidedAt, ctx.timeZone);
  await BandDecisionRow.create({ changeId: req.id, decision: 'rejected', decidedBy: supervisor.id, decidedAt: new Date(decidedAt), note });
  await auditAt(decidedAt, supervisor.id, 'band.reject', 'tank', a3, { changeId: req.id }, note, old);
}
