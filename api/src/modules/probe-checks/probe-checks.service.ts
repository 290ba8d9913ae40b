import { probeCheck } from '../../../../shared/redox/index.ts';
import type {
  ProbeCheckInput, ProbeCheckRow, ProbeDue, ProbeReplacementInput, ProbeReplacementRow,
} from '../../../../shared/schemas/probe-checks.ts';
import { FUTURE_SKEW_MS } from '../../../../shared/schemas/workbench.ts';
import { Probe } from '../../db/models.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import type { Bus } from '../../realtime/bus.ts';
import { writeAudit } from '../audit.repository.ts';
import { referenceTableOf } from '../readings/probe-cache.ts';
import { siteSettingsRepository } from '../site-settings/site-settings.repository.ts';
import { probeChecksRepository as repo, type ProbeFacts } from './probe-checks.repository.ts';

const DAY_MS = 86_400_000;

/** A check or a replacement changes whether the probe's next readings are marked suspect. */
async function announce(bus: Bus | undefined, probeId: number): Promise<void> {
  await bus?.invalidateProbeCache().catch((err: Error) => logger.warn({ err: err.message, probeId }, 'could not announce the probe check'));
}

async function requireProbe(id: number): Promise<ProbeFacts> {
  const [p] = await repo.probes({ id });
  if (!p) throw AppError.notFound('Probe');
  return p;
}

function notFuture(iso: string | undefined, what: string): Date {
  const d = iso ? new Date(iso) : new Date();
  if (d.getTime() > Date.now() + FUTURE_SKEW_MS) throw AppError.badRequest(`${what} is in the future`);
  return d;
}

/**
 * When a probe is next due: a replacement or a failed check makes it due at once (it must be
 * proven before its readings are trusted); otherwise the interval runs from the last pass,
 * or from installation when it has never been checked.
 */
export function dueOf(p: ProbeFacts, intervalDays: number, h: { last?: { at: Date; pass: boolean }; lastPass?: Date; lastReplacement?: Date }): Pick<ProbeDue, 'dueAt' | 'basis'> {
  const intervalMs = intervalDays * DAY_MS;
  if (h.lastReplacement && (!h.last || h.lastReplacement > h.last.at)) return { dueAt: h.lastReplacement.toISOString(), basis: 'replacement' };
  if (h.last && !h.last.pass) return { dueAt: h.last.at.toISOString(), basis: 'failed-check' };
  if (h.lastPass) return { dueAt: new Date(h.lastPass.getTime() + intervalMs).toISOString(), basis: 'last-pass' };
  return { dueAt: new Date(p.installedAt.getTime() + intervalMs).toISOString(), basis: 'installation' };
}

export const probeChecksService = {
  async record(input: ProbeCheckInput, userId: number, bus?: Bus): Promise<ProbeCheckRow> {
    const p = await requireProbe(input.probeId);
    const checkedAt = notFuture(input.checkedAt, 'The check time');
    const toleranceMv = input.toleranceMv ?? p.toleranceMv;
    const reference = {
      id: p.referenceId, label: p.referenceId, e25V: p.referenceE25V, coeffVPerK: p.referenceCoeffVPerK, source: `probe ${p.tag}`,
      ...referenceTableOf(p.referenceTable),
    };
    let result: ReturnType<typeof probeCheck>;
    try {
      result = probeCheck({ standard: input.standard, tempC: input.tempC, reference, readingMv: input.readingMv, toleranceMv });
    } catch (err) {
      throw new AppError(400, 'bad-request', (err as Error).message, { errors: [{ path: 'tempC', message: (err as Error).message }] });
    }
    const id = await Probe.sequelize!.transaction(async (tx) => {
      const newId = await repo.insertCheck({
        probeId: p.id, standard: input.standard, tempC: input.tempC, readingMv: input.readingMv, toleranceMv, ...result,
        referenceE25V: p.referenceE25V, referenceCoeffVPerK: p.referenceCoeffVPerK, checkedAt, checkedBy: userId, note: input.note || null,
      }, tx);
      await writeAudit({ userId, action: 'probe.check', entity: 'probe', entityId: p.id, after: { checkId: newId, ...input, toleranceMv, ...result } }, tx);
      return newId;
    });
    await announce(bus, p.id);
    if (!result.pass) {
      const latest = await repo.markLatestSuspect(p.id);
      if (latest) await bus?.publishLatest(latest.siteTag, [latest.reading]).catch((err: Error) => logger.warn({ err: err.message, probeId: p.id }, 'could not push the suspect mark'));
    }
    return (await repo.checks({ ids: [id], limit: 1 }))[0];
  },

  list: (filter: { probeId?: number; limit: number }) => repo.checks(filter),

  async due(now = new Date()): Promise<ProbeDue[]> {
    const [probes, history, schedules] = await Promise.all([repo.probes(), repo.history(), repo.schedules()]);
    const defaults = new Map<number, number>();
    const out: ProbeDue[] = [];
    for (const p of probes) {
      if (!defaults.has(p.tankId)) defaults.set(p.tankId, (await siteSettingsRepository.forTank(p.tankId)).probeCheckIntervalDays);
      const intervalDays = schedules.get(p.id) ?? defaults.get(p.tankId)!;
      const h = history.get(p.id) ?? {};
      const due = dueOf(p, intervalDays, h);
      out.push({
        probeId: p.id, probeTag: p.tag, tankId: p.tankId, tankTag: p.tankTag, intervalDays,
        lastCheck: h.last ? { at: h.last.at.toISOString(), pass: h.last.pass, errorMv: h.last.errorMv } : null,
        lastReplacementAt: h.lastReplacement?.toISOString() ?? null, ...due, overdue: Date.parse(due.dueAt) <= now.getTime(),
      });
    }
    return out;
  },

  async setInterval(probeId: number, intervalDays: number, reason: string, userId: number): Promise<void> {
    await requireProbe(probeId);
    await Probe.sequelize!.transaction(async (tx) => {
      const before = await repo.setSchedule(probeId, intervalDays, userId, tx);
      await writeAudit({ userId, action: 'probe.check-interval', entity: 'probe', entityId: probeId, before: { intervalDays: before }, after: { intervalDays }, reason }, tx);
    });
  },

  async replace(input: ProbeReplacementInput, userId: number, bus?: Bus): Promise<ProbeReplacementRow> {
    const p = await requireProbe(input.probeId);
    const replacedAt = notFuture(input.replacedAt, 'The replacement time');
    await Probe.sequelize!.transaction(async (tx) => {
      const id = await repo.insertReplacement({
        probeId: p.id, part: input.part, replacedAt, reason: input.reason, note: input.note || null, createdBy: userId, createdAt: new Date(),
      }, tx);
      await writeAudit({ userId, action: 'probe.replacement', entity: 'probe', entityId: p.id, after: { replacementId: id, ...input }, reason: input.reason }, tx);
    });
    await announce(bus, p.id);
    return (await repo.replacements({ probeId: p.id, limit: 1 }))[0];
  },

  replacements: (filter: { probeId?: number; limit: number }) => repo.replacements(filter),
};

/** For the probe-check-overdue alarm: active probes whose check is due at or before `now`. */
export async function overdueProbeChecks(now = new Date()): Promise<ProbeDue[]> {
  return (await probeChecksService.due(now)).filter((d) => d.overdue);
}
