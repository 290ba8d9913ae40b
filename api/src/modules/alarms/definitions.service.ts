import { CIRCUIT_TEMPLATES, templateById } from '../../../../shared/alarms/templates.ts';
import { definitionSettingsSchema, type CreateDefinitionInput, type DefinitionSettings, type DefinitionView, type UpdateDefinitionInput } from '../../../../shared/schemas/alarms.ts';
import { Tank } from '../../db/models.ts';
import { AppError } from '../../lib/app-error.ts';
import { writeAudit } from '../audit.repository.ts';
import { definitionsRepository as repo } from './definitions.repository.ts';

/** Alarm definitions: created per tank from circuit templates, edited with a recorded reason (audit_log). */
const settingsOf = (v: DefinitionView): DefinitionSettings => ({
  kind: v.kind, priority: v.priority, threshold: v.threshold, deadband: v.deadband, onDelayS: v.onDelayS,
  offDelayS: v.offDelayS, windowS: v.windowS, rationalisation: v.rationalisation,
});

export const definitionsService = {
  list: (tankId?: number) => repo.list(repo.db(), tankId),
  templates: () => CIRCUIT_TEMPLATES,

  async create(input: CreateDefinitionInput, userId: number): Promise<DefinitionView> {
    if (!(await Tank.findByPk(input.tankId))) throw AppError.notFound('Tank');
    const { tankId, reason, ...settings } = input;
    return repo.db().transaction(async (t) => {
      const id = await repo.insert(repo.db(), tankId, settings, new Date(), t);
      if (id === null) throw AppError.conflict('This tank already has an alarm of that kind: edit it instead');
      const created = (await repo.get(repo.db(), id, t))!;
      await writeAudit({ userId, action: 'alarm-definition.create', entity: 'alarm_definition', entityId: id, after: created, reason }, t);
      return created;
    });
  },

  async update(id: number, input: UpdateDefinitionInput, userId: number): Promise<DefinitionView> {
    return repo.db().transaction(async (t) => {
      const before = await repo.get(repo.db(), id, t);
      if (!before) throw AppError.notFound('Alarm definition');
      const { reason, rationalisation, ...rest } = input;
      const merged = definitionSettingsSchema.parse({
        ...settingsOf(before), ...rest, rationalisation: { ...before.rationalisation, ...rationalisation },
      });
      await repo.update(repo.db(), id, merged, new Date(), t);
      const after = (await repo.get(repo.db(), id, t))!;
      await writeAudit({ userId, action: 'alarm-definition.update', entity: 'alarm_definition', entityId: id, before, after, reason }, t);
      return after;
    });
  },

  /** Creates the template's definitions a tank lacks; existing ones are left as they are. */
  async applyTemplate(templateId: string, tankIds: number[], reason: string, userId: number | null) {
    const template = templateById(templateId);
    if (!template) throw AppError.notFound('Template');
    const created: number[] = [];
    await repo.db().transaction(async (t) => {
      for (const tankId of tankIds) {
        if (!(await Tank.findByPk(tankId, { transaction: t }))) throw AppError.notFound(`Tank ${tankId}`);
        for (const d of template.definitions) {
          const id = await repo.insert(repo.db(), tankId, d, new Date(), t);
          if (id !== null) created.push(id);
        }
      }
      await writeAudit({ userId, action: 'alarm-definition.apply-template', entity: 'alarm_template', entityId: templateId, after: { tankIds, created }, reason }, t);
    });
    return { created };
  },
};
