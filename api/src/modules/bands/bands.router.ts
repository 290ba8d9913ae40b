import { Router } from 'express';
import {
  bandChangeSchema, bandChangesQuerySchema, bandCopySchema, bandDecisionSchema, bandRejectSchema,
} from '../../../../shared/schemas/bands.ts';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body, params, queryParams } from '../../middleware/validate.ts';
import type { Bus } from '../../realtime/bus.ts';
import { bandsService } from './bands.service.ts';

/** Bands: everyone reads; metallurgists and admins change; supervisors and metallurgists decide large changes. */
export function bandsRouter(bus?: Bus): Router {
  const r = Router();
  const change = requireRole('metallurgist', 'admin');
  const decide = requireRole('supervisor', 'metallurgist');
  r.get('/', requireSignIn, async (_req, res) => {
    res.json(await bandsService.list());
  });
  r.get('/changes', requireSignIn, async (req, res) => {
    res.json({ changes: await bandsService.changes(queryParams(bandChangesQuerySchema, req)) });
  });
  r.put('/:id', change, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json({ change: await bandsService.change(id, body(bandChangeSchema, req), req.user!, bus) });
  });
  r.post('/:id/copy', change, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.status(201).json({ changes: await bandsService.copy(id, body(bandCopySchema, req), req.user!, bus) });
  });
  r.post('/changes/:id/approve', decide, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json({ change: await bandsService.decide(id, 'approved', req.user!, body(bandDecisionSchema, req).note ?? null, bus) });
  });
  r.post('/changes/:id/reject', decide, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json({ change: await bandsService.decide(id, 'rejected', req.user!, body(bandRejectSchema, req).note, bus) });
  });
  r.post('/changes/:id/withdraw', change, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json({ change: await bandsService.decide(id, 'withdrawn', req.user!, body(bandDecisionSchema, req).note ?? null, bus) });
  });
  return r;
}
