import type { LogEntryInput, ShiftLogEntryView, ShiftLogResponse } from '../../../../shared/schemas/shifts.ts';
import { Site } from '../../db/models.ts';
import { AppError } from '../../lib/app-error.ts';
import { writeAudit } from '../audit.repository.ts';
import { shiftLogRepository } from './shift-log.repository.ts';
import { shiftsRepository } from './shifts.repository.ts';
import { resolveShift, shiftView, siteContext } from './site-shifts.ts';

type Actor = { id: number };

export const shiftLogService = {
  /** A shift with its entries: the one containing `atIso`, or the shift new entries go to now. */
  async log(siteId: number | undefined, atIso: string | undefined): Promise<ShiftLogResponse> {
    const ctx = await siteContext(siteId);
    let s = await resolveShift(ctx, atIso ? Date.parse(atIso) : Date.now());
    // Once the current shift is handed over, what is written belongs to the next one.
    for (let i = 0; !atIso && s.row?.closedAt && i < 3; i += 1) s = await resolveShift(ctx, s.endsAtMs);
    return {
      shift: shiftView(ctx.site.id, s),
      entries: s.row ? await shiftLogRepository.ofShift(s.row.id) : [],
      timeZone: ctx.site.timeZone,
    };
  },

  /** Appends an entry to the first shift, from now on, that is not closed. */
  async add(input: LogEntryInput, by: Actor): Promise<ShiftLogEntryView> {
    const ctx = await siteContext(input.siteId);
    if (input.tankId && !(await shiftLogRepository.tankOnSite(input.tankId, ctx.site.id))) {
      throw AppError.badRequest('That tank is not on this site');
    }
    if (input.alarmId && !(await shiftLogRepository.alarmOnSite(input.alarmId, ctx.site.id))) {
      throw AppError.badRequest('No alarm with that number on this site');
    }
    if (input.correctsId) {
      const original = await shiftLogRepository.byId(input.correctsId);
      if (!original || original.siteId !== ctx.site.id) throw AppError.badRequest('The entry to correct does not exist on this site');
    }
    const id = await Site.sequelize!.transaction(async (transaction) => {
      let s = await resolveShift(ctx, Date.now());
      for (let i = 0; i < 4; i += 1) {
        const row = await shiftsRepository.lockOrCreate(ctx.site.id, s.startsAtMs, s.endsAtMs, transaction);
        if (!row.closedAt) {
          return shiftLogRepository.insert({
            shiftId: row.id, authorId: by.id, body: input.body, tankId: input.tankId ?? null,
            alarmId: input.alarmId ?? null, correctsId: input.correctsId ?? null,
          }, transaction);
        }
        s = await resolveShift(ctx, s.endsAtMs);
      }
      throw AppError.conflict('The next shifts are already closed; nothing can be written now');
    });
    return (await shiftLogRepository.byId(id))!;
  },

  /**
   * An author may reword their own entry while its shift is open. After the handover the
   * record is frozen: a correction is a new entry pointing at the original.
   */
  async edit(id: number, body: string, by: Actor): Promise<ShiftLogEntryView> {
    await Site.sequelize!.transaction(async (transaction) => {
      // The locking read covers the joined shift row too, so a handover in progress is either before or after this edit.
      const entry = await shiftLogRepository.byId(id, transaction);
      if (!entry) throw AppError.notFound('Log entry');
      if (entry.author.id !== by.id) throw AppError.forbidden('Only the author can change an entry; add a correction instead');
      if (entry.shiftClosed) throw AppError.conflict('The shift is closed: entries cannot be changed; add a correction instead');
      await shiftLogRepository.updateBody(id, body, transaction);
      await writeAudit({ userId: by.id, action: 'shift-log.edit', entity: 'shift-log-entry', entityId: id, before: { body: entry.body }, after: { body } }, transaction);
    });
    return (await shiftLogRepository.byId(id))!;
  },
};
