import { Router } from 'express';
import type { Role } from '../../../../shared/schemas/auth.ts';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { policySchema, removeShiftSchema, rotationSchema, shiftSchema, shiftsQuerySchema } from '../../../../shared/schemas/roster.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body, params, queryParams } from '../../middleware/validate.ts';
import { rosterService as svc } from './roster.service.ts';

/** Supervisors and admins manage the roster; everyone sees who is on call. */
export const ROSTER_ROLES: Role[] = ['supervisor', 'admin'];
const DAY = 86_400_000;

export function rosterRouter(): Router {
  const r = Router();
  r.use(requireSignIn);
  r.get('/now', async (_req, res) => {
    res.json(await svc.onCallNow());
  });
  r.get('/shifts', async (req, res) => {
    // Default: yesterday to two weeks ahead, the span the Call roster shows first.
    const q = req.query.from || req.query.to ? queryParams(shiftsQuerySchema, req) : { from: new Date(Date.now() - DAY).toISOString(), to: new Date(Date.now() + 14 * DAY).toISOString() };
    res.json({ shifts: await svc.shifts(new Date(q.from), new Date(q.to)) });
  });
  r.post('/shifts', requireRole(...ROSTER_ROLES), async (req, res) => {
    res.status(201).json({ shift: await svc.create(body(shiftSchema, req), req.user!.id) });
  });
  r.patch('/shifts/:id', requireRole(...ROSTER_ROLES), async (req, res) => {
    res.json({ shift: await svc.update(params(idParamSchema, req).id, body(shiftSchema, req), req.user!.id) });
  });
  r.delete('/shifts/:id', requireRole(...ROSTER_ROLES), async (req, res) => {
    const { id } = params(idParamSchema, req);
    await svc.remove(id, body(removeShiftSchema, req).reason, req.user!.id);
    res.status(204).end();
  });
  r.post('/rotation', requireRole(...ROSTER_ROLES), async (req, res) => {
    res.status(201).json(await svc.rotation(body(rotationSchema, req), req.user!.id));
  });
  r.get('/policy', async (_req, res) => {
    res.json({ steps: await svc.policy() });
  });
  r.put('/policy', requireRole(...ROSTER_ROLES), async (req, res) => {
    res.json(await svc.setPolicy(body(policySchema, req), req.user!.id));
  });
  return r;
}
