import { Router } from 'express';
import { calibrationApplySchema, calibrationFitSchema, recomputeSchema } from '../../../../shared/schemas/calibration.ts';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body, params } from '../../middleware/validate.ts';
import type { Bus } from '../../realtime/bus.ts';
import { calibrationService } from './calibration.service.ts';

/**
 * Calibration per tank (:id is the tank). A fit writes nothing, so anyone signed in may run one
 * to look; applying and recomputing are for metallurgists and admins.
 */
export function calibrationRouter(bus?: Bus): Router {
  const r = Router();
  const write = requireRole('metallurgist', 'admin');
  r.get('/:id', requireSignIn, async (req, res) => {
    res.json(await calibrationService.overview(params(idParamSchema, req).id));
  });
  r.post('/:id/fit', requireSignIn, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json(await calibrationService.fit(id, body(calibrationFitSchema, req)));
  });
  r.post('/:id/apply', write, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.status(201).json(await calibrationService.apply(id, body(calibrationApplySchema, req), req.user!.id, bus));
  });
  r.post('/:id/recompute', write, async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json(await calibrationService.recompute(id, body(recomputeSchema, req), req.user!.id));
  });
  return r;
}
