import type { Router } from 'express';
import { z } from 'zod';
import type { Role } from '../../../../shared/schemas/auth.ts';
import { applyTemplateSchema, createDefinitionSchema, updateDefinitionSchema } from '../../../../shared/schemas/alarms.ts';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { requireRole } from '../../middleware/auth.ts';
import { body, params, queryParams } from '../../middleware/validate.ts';
import { definitionsService as svc } from './definitions.service.ts';

/** Metallurgists and admins own alarm settings (the band owners); every change carries a reason. */
const EDIT_ROLES: Role[] = ['metallurgist', 'admin'];

/** Adds the definition and template routes to the alarms router (same /api/alarms prefix). */
export function definitionsRouter(r: Router): void {
  r.get('/definitions', async (req, res) => {
    const { tank } = queryParams(z.object({ tank: z.coerce.number().int().positive().optional() }), req);
    res.json({ definitions: await svc.list(tank) });
  });
  r.post('/definitions', requireRole(...EDIT_ROLES), async (req, res) => {
    res.status(201).json({ definition: await svc.create(body(createDefinitionSchema, req), req.user!.id) });
  });
  r.patch('/definitions/:id', requireRole(...EDIT_ROLES), async (req, res) => {
    res.json({ definition: await svc.update(params(idParamSchema, req).id, body(updateDefinitionSchema, req), req.user!.id) });
  });
  r.get('/templates', (_req, res) => {
    res.json({ templates: svc.templates() });
  });
  r.post('/templates/apply', requireRole(...EDIT_ROLES), async (req, res) => {
    const input = body(applyTemplateSchema, req);
    res.status(201).json(await svc.applyTemplate(input.templateId, input.tankIds, input.reason, req.user!.id));
  });
}
