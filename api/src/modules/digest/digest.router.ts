import { Router } from 'express';
import { digestQuerySchema } from '../../../../shared/schemas/digest.ts';
import { requireSignIn } from '../../middleware/auth.ts';
import { queryParams } from '../../middleware/validate.ts';
import { digestService } from './digest.service.ts';

/**
 * /api/digest: the Shift digest. Open to everyone signed in: the incoming shift reads the
 * handover, supervisors write it, metallurgists review the week.
 */
export function digestRouter(): Router {
  const r = Router();
  r.get('/', requireSignIn, async (req, res) => {
    res.json(await digestService.digest(queryParams(digestQuerySchema, req)));
  });
  return r;
}
