import { formatClockMin, parseClock } from '../../../../shared/shifts/shift-boundaries.ts';
import type { CloseShiftInput, ShiftPatternInput, ShiftPatternView, ShiftView } from '../../../../shared/schemas/shifts.ts';
import { Site } from '../../db/models.ts';
import { AppError } from '../../lib/app-error.ts';
import { writeAudit } from '../audit.repository.ts';
import { shiftsRepository } from './shifts.repository.ts';
import { resolveShift, shiftView, siteContext, type SiteContext } from './site-shifts.ts';

type Actor = { id: number };

function patternView(ctx: SiteContext): ShiftPatternView {
  return {
    siteId: ctx.site.id, timeZone: ctx.site.timeZone, shiftsPerDay: ctx.pattern.shiftsPerDay,
    firstStart: formatClockMin(ctx.pattern.firstStartMin), saved: ctx.saved,
  };
}

export const shiftsService = {
  pattern: async (siteId?: number) => patternView(await siteContext(siteId)),

  async setPattern(input: ShiftPatternInput, by: Actor): Promise<ShiftPatternView> {
    const ctx = await siteContext(input.siteId);
    const next = { shiftsPerDay: input.shiftsPerDay, firstStartMin: parseClock(input.firstStart) };
    await Site.sequelize!.transaction(async (transaction) => {
      await shiftsRepository.savePattern(ctx.site.id, next, by.id, transaction);
      await writeAudit({
        userId: by.id, action: 'shift-pattern.set', entity: 'site', entityId: ctx.site.id,
        before: ctx.saved ? patternView(ctx) : null, after: { shiftsPerDay: next.shiftsPerDay, firstStart: input.firstStart },
      }, transaction);
    });
    return patternView({ ...ctx, pattern: next, saved: true });
  },

  /** The current shift and the `count − 1` before it, newest first. */
  async list(siteId: number | undefined, count: number): Promise<{ timeZone: string; shifts: ShiftView[] }> {
    const ctx = await siteContext(siteId);
    const now = Date.now();
    const shifts: ShiftView[] = [];
    let at = now;
    for (let i = 0; i < count; i += 1) {
      const s = await resolveShift(ctx, at);
      shifts.push(shiftView(ctx.site.id, s, now));
      at = s.startsAtMs - 1;
    }
    return { timeZone: ctx.site.timeZone, shifts };
  },

  /**
   * Closes a shift with its handover note. Only a shift that has started, only once; from then
   * on its entries are frozen (corrections go into a later shift, pointing at the original).
   */
  async close(input: CloseShiftInput, by: Actor): Promise<ShiftView> {
    const ctx = await siteContext(input.siteId);
    const startsAtMs = Date.parse(input.startsAt);
    const s = await resolveShift(ctx, startsAtMs);
    if (s.startsAtMs !== startsAtMs) {
      throw AppError.badRequest(`No shift starts at ${input.startsAt}; the shift containing it starts at ${new Date(s.startsAtMs).toISOString()}`);
    }
    if (startsAtMs > Date.now()) throw AppError.badRequest('This shift has not started yet');
    await Site.sequelize!.transaction(async (transaction) => {
      const row = await shiftsRepository.lockOrCreate(ctx.site.id, s.startsAtMs, s.endsAtMs, transaction);
      if (row.closedAt) throw AppError.conflict(`This shift was already closed at ${row.closedAt.toISOString()}`);
      await shiftsRepository.close(row.id, by.id, input.handoverNote, transaction);
      await writeAudit({ userId: by.id, action: 'shift.close', entity: 'shift', entityId: row.id, after: { startsAt: input.startsAt } }, transaction);
    });
    return shiftView(ctx.site.id, await resolveShift(ctx, startsAtMs));
  },
};
