import { Router } from 'express';
import { idParamSchema, trendQuerySchema } from '../../../../shared/schemas/plant.ts';
import { AppError } from '../../lib/app-error.ts';
import { requireSignIn } from '../../middleware/auth.ts';
import { params, queryParams } from '../../middleware/validate.ts';
import { plantService } from './plant.service.ts';

export function plantRouter(): Router {
  const r = Router();
  r.use(requireSignIn);
  r.get('/plant', async (_req, res) => {
    res.json({ sites: await plantService.tree(), serverTime: new Date().toISOString() });
  });
  r.get('/tanks/:id', async (req, res) => {
    const found = await plantService.tank(params(idParamSchema, req).id);
    if (!found) throw AppError.notFound('Tank');
    res.json(found);
  });
  r.get('/tanks/:id/trend', async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json(await plantService.trend(id, queryParams(trendQuerySchema, req)));
  });
  return r;
}
