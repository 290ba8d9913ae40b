import type { PolicyInput, RotationInput, ShiftInput } from '../../../../shared/schemas/roster.ts';
import { AppError } from '../../lib/app-error.ts';
import { writeAudit } from '../audit.repository.ts';
import { rosterRepository as repo } from './roster.repository.ts';

/** Call roster: supervisors and admins manage shifts and the escalation policy; every change is audited. */
export const rosterService = {
  async onCallNow(at = new Date()) {
    return { at: at.toISOString(), shifts: await repo.onCall(repo.db(), at) };
  },

  shifts: (from: Date, to: Date) => repo.shifts(repo.db(), from, to),

  async create(input: ShiftInput, userId: number) {
    return repo.db().transaction(async (t) => {
      const id = await repo.insert(repo.db(), input, userId, t);
      const shift = (await repo.get(repo.db(), id, t))!;
      await writeAudit({ userId, action: 'roster.create', entity: 'roster_shift', entityId: id, after: shift }, t);
      return shift;
    });
  },

  async update(id: number, input: ShiftInput, userId: number) {
    return repo.db().transaction(async (t) => {
      const before = await repo.get(repo.db(), id, t);
      if (!before) throw AppError.notFound('Shift');
      await repo.update(repo.db(), id, input, t);
      const after = (await repo.get(repo.db(), id, t))!;
      await writeAudit({ userId, action: 'roster.update', entity: 'roster_shift', entityId: id, before, after }, t);
      return after;
    });
  },

  async remove(id: number, reason: string, userId: number) {
    await repo.db().transaction(async (t) => {
      const before = await repo.get(repo.db(), id, t);
      if (!before) throw AppError.notFound('Shift');
      await repo.remove(repo.db(), id, t);
      await writeAudit({ userId, action: 'roster.remove', entity: 'roster_shift', entityId: id, before, reason }, t);
    });
  },

  /** People take turns: shift i goes to people[i % n], back to back from startsAt. */
  async rotation(input: RotationInput, userId: number) {
    const start = Date.parse(input.startsAt);
    const len = input.shiftHours * 3_600_000;
    return repo.db().transaction(async (t) => {
      const ids: number[] = [];
      for (let i = 0; i < input.count; i += 1) {
        const p = input.people[i % input.people.length];
        ids.push(await repo.insert(repo.db(), {
          personName: p.personName, email: p.email, roleOnCall: input.roleOnCall,
          startsAt: new Date(start + i * len).toISOString(), endsAt: new Date(start + (i + 1) * len).toISOString(),
        }, userId, t));
      }
      await writeAudit({ userId, action: 'roster.rotation', entity: 'roster_shift', entityId: null, after: { ...input, ids } }, t);
      return { created: ids };
    });
  },

  policy: () => repo.policy(repo.db()),

  async setPolicy(input: PolicyInput, userId: number) {
    return repo.db().transaction(async (t) => {
      const before = (await repo.policy(repo.db(), t)).filter((s) => s.priority === input.priority);
      await repo.replacePolicy(repo.db(), input.priority, input.steps, t);
      await writeAudit({ userId, action: 'escalation.update', entity: 'escalation_policy', entityId: input.priority, before, after: input.steps, reason: input.reason }, t);
      return { steps: (await repo.policy(repo.db(), t)).filter((s) => s.priority === input.priority) };
    });
  },
};
