/**
 * How people and the other features answered the week's alarms: supervisors acknowledge from
 * the Alarm desk, the metallurgist takes B2's stale alarm out of service while its probe is out,
 * and the calibration-drift alarm follows the assays as the engine's tick would.
 */
import { idleMemory, stepCondition, type ConditionMemory } from '../../shared/alarms/condition.ts';
import { matchAssays } from '../../api/src/modules/assays/assay-match.ts';
import type { DemoContext } from './demo-context.ts';
import type { SeededAssay, SeededCheck } from './demo-lab.ts';
import { crewAt } from './demo-people.ts';
import { DAY_MS, HOUR_MS, MINUTE_MS } from './demo-story.ts';
import { AUTOMATIC, type AlarmDefinitionRow, type PlannedAction } from './history-alarms.ts';
import { seededRng } from './seeded-random.ts';

const ASSAY_MATCH_WINDOW_MIN = 10; // the site setting's default
/** The engine's tick asks the assays feature about once a minute. */
const TICK_LAG_MS = 60_000;

export function acknowledgements(ctx: DemoContext, defs: AlarmDefinitionRow[], actions: PlannedAction[]): PlannedAction[] {
  const rng = seededRng('kestrel-alarms/acks');
  const byId = new Map(defs.map((d) => [d.id, d]));
  const upsetTankId = ctx.tanks.get(ctx.story.upset.tankTag)!.id;
  return actions.filter((a) => a.action === 'activate').map((a) => {
    const def = byId.get(a.definitionId)!;
    const delayMs = (def.priority === 1 ? rng.between(1.5, 3.5) : def.priority === 2 ? rng.between(3, 9) : rng.between(20, 60)) * MINUTE_MS;
    const atMs = Math.min(a.atMs + delayMs, ctx.story.endMs - MINUTE_MS);
    const inUpset = def.tankId === upsetTankId && a.atMs >= ctx.story.upset.fromMs && a.atMs < ctx.story.upset.toMs + 30 * MINUTE_MS;
    const { supervisor } = crewAt(ctx.people, atMs, ctx.timeZone);
    const comment = inUpset && def.kind === 'ratio-below-band' ? 'Feed surge from the regrind thickener: underflow to A3 cut back, A3 air raised'
      : def.kind === 'calibration-drift' ? 'Asked metallurgy to check the probe against ZoBell'
        : def.kind === 'probe-check-overdue' ? 'Told metallurgy: check to be done on the day shift' : undefined;
    return {
      atMs, definitionId: def.id, action: 'acknowledge' as const, actor: { userId: supervisor.id, name: supervisor.name, how: 'screen' as const }, comment,
    };
  });
}

/** B2's probe is out for cleaning: its stale alarm is taken out of service first, then put back. */
export function cleaningActions(ctx: DemoContext, defs: AlarmDefinitionRow[]): PlannedAction[] {
  const d = ctx.story.drift;
  const tankId = ctx.tanks.get(d.tankTag)!.id;
  const stale = defs.find((x) => x.tankId === tankId && x.kind === 'stale');
  if (!stale || stale.threshold === null) return [];
  const met = ctx.people.metallurgist;
  const person = { userId: met.id, name: met.name, how: 'screen' as const };
  const intervalS = 5;
  const lastReadingMs = d.pulledMs - MINUTE_MS;
  const staleAtMs = lastReadingMs + (stale.threshold + 1) * intervalS * 1000;
  return [
    { atMs: d.pulledMs - 3 * MINUTE_MS, definitionId: stale.id, action: 'remove-from-service', actor: person, reason: 'B2 probe pulled for cleaning: reads low against assays and in ZoBell' },
    { atMs: staleAtMs, definitionId: stale.id, action: 'activate', actor: AUTOMATIC, value: stale.threshold + 1, limit: stale.threshold },
    { atMs: d.refittedMs + 2_000, definitionId: stale.id, action: 'clear', actor: AUTOMATIC, value: 0.4, limit: stale.threshold },
    { atMs: d.refittedMs + 4 * MINUTE_MS, definitionId: stale.id, action: 'return-to-service', actor: person, comment: 'Probe refitted and checked in ZoBell' },
  ];
}

/** The overdue probe's check falls due during the week: the engine's tick raises it and it still stands. */
export function overdueActions(ctx: DemoContext, defs: AlarmDefinitionRow[], checks: SeededCheck[], intervalDays: number): PlannedAction[] {
  const probeTag = ctx.story.overdueProbeTag;
  const probe = ctx.probes.get(probeTag);
  const def = probe && defs.find((x) => x.tankId === ctx.tanks.get(probe.tankTag)!.id && x.kind === 'probe-check-overdue');
  const lastPass = checks.filter((c) => c.probeTag === probeTag && c.pass).sort((a, b) => b.atMs - a.atMs)[0];
  if (!def || !lastPass) return [];
  const atMs = lastPass.atMs + intervalDays * DAY_MS + TICK_LAG_MS;
  if (atMs >= ctx.story.endMs) return [];
  return [{ atMs, definitionId: def.id, action: 'activate', actor: AUTOMATIC, value: TICK_LAG_MS / HOUR_MS, limit: def.threshold ?? 0 }];
}

export type DriftEvent = { atMs: number; tankTag: string; change: 'activate' | 'clear'; diffMv: number; labRef: string };

/**
 * The calibration-drift alarm as the engine's tick judges it: the newest matched assay's
 * probe-minus-lab difference, looked at when each result is entered.
 */
export async function driftActions(ctx: DemoContext, defs: AlarmDefinitionRow[], assays: SeededAssay[]): Promise<{ actions: PlannedAction[]; events: DriftEvent[] }> {
  const matches = await matchAssays(assays.map((a) => ({ id: a.id, labRatio: a.labRatio })), ASSAY_MATCH_WINDOW_MIN);
  const actions: PlannedAction[] = [];
  const events: DriftEvent[] = [];
  for (const [tankTag, tank] of ctx.tanks) {
    const def = defs.find((x) => x.tankId === tank.id && x.kind === 'calibration-drift');
    if (!def || def.threshold === null) continue;
    const mine = assays.filter((a) => a.tankTag === tankTag).sort((a, b) => a.enteredAtMs - b.enteredAtMs);
    let memory: ConditionMemory = idleMemory(false);
    for (const [i, entered] of mine.entries()) {
      const newest = mine.slice(0, i + 1).filter((a) => matches.get(a.id)?.diffMv != null).sort((a, b) => b.sampledAtMs - a.sampledAtMs)[0];
      if (!newest) continue;
      const diffMv = matches.get(newest.id)!.diffMv!;
      const atMs = entered.enteredAtMs + TICK_LAG_MS;
      const step = stepCondition(memory, { direction: 'high', limit: def.threshold, deadband: def.deadband, onDelayS: def.onDelayS, offDelayS: def.offDelayS }, Math.abs(diffMv), atMs);
      memory = step.change ? idleMemory(step.change === 'activate') : step.memory;
      if (!step.change) continue;
      actions.push({ atMs, definitionId: def.id, action: step.change, actor: AUTOMATIC, value: Math.abs(diffMv), limit: def.threshold });
      events.push({ atMs, tankTag, change: step.change, diffMv, labRef: newest.labRef });
    }
  }
  return { actions, events };
}
