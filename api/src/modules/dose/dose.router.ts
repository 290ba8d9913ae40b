import { Router } from 'express';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { requireSignIn } from '../../middleware/auth.ts';
import { params } from '../../middleware/validate.ts';
import { doseService } from './dose.service.ts';

/** Dose advisor inputs for one tank (:id). Read-only and advisory: it sends no command to the plant. */
export function doseRouter(): Router {
  const r = Router();
  r.use(requireSignIn);
  r.get('/:id', async (req, res) => {
    res.json(await doseService.inputs(params(idParamSchema, req).id));
  });
  return r;
}
