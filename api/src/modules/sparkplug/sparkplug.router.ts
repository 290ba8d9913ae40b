import { Router } from 'express';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { sparkplugGroupCreateSchema, sparkplugMappingCreateSchema } from '../../../../shared/schemas/sparkplug.ts';
import { requireRole } from '../../middleware/auth.ts';
import { body, params } from '../../middleware/validate.ts';
import type { Bus } from '../../realtime/bus.ts';
import { sparkplugService } from './sparkplug.service.ts';

/** Plant setup → Sparkplug edge nodes: admins only (it decides which device feeds which probe). */
export function sparkplugRouter(o: { bus?: Bus; hostId: string }): Router {
  const r = Router();
  r.use(requireRole('admin'));
  r.get('/', async (_req, res) => {
    res.json(await sparkplugService.setup(o.hostId));
  });
  r.post('/groups', async (req, res) => {
    res.status(201).json({ id: await sparkplugService.createGroup(body(sparkplugGroupCreateSchema, req), req.user!.id, o.bus) });
  });
  r.delete('/groups/:id', async (req, res) => {
    await sparkplugService.deleteGroup(params(idParamSchema, req).id, req.user!.id, o.bus);
    res.status(204).end();
  });
  r.post('/mappings', async (req, res) => {
    res.status(201).json({ id: await sparkplugService.createMapping(body(sparkplugMappingCreateSchema, req), req.user!.id, o.bus) });
  });
  r.delete('/mappings/:id', async (req, res) => {
    await sparkplugService.deleteMapping(params(idParamSchema, req).id, req.user!.id, o.bus);
    res.status(204).end();
  });
  return r;
}
