import { Router } from 'express';
import { deadLetterQuerySchema, type DeadLetterPage } from '../../../../shared/schemas/dead-letters.ts';
import { requireRole } from '../../middleware/auth.ts';
import { queryParams } from '../../middleware/validate.ts';
import { deadLettersService } from './dead-letters.service.ts';

/** Dead letters and conflicts, for the people who commission and look after devices. */
export function deadLettersRouter(opts: { retentionDays: number }): Router {
  const r = Router();
  r.get('/', requireRole('admin', 'engineer'), async (req, res) => {
    const page: DeadLetterPage = await deadLettersService.page(queryParams(deadLetterQuerySchema, req), opts.retentionDays);
    res.json(page);
  });
  return r;
}
