import { CSV_TYPE } from '../../lib/csv.ts';
import { Router } from 'express';
import { exportQuerySchema } from '../../../../shared/schemas/export.ts';
import { logger } from '../../lib/logger.ts';
import { requireSignIn } from '../../middleware/auth.ts';
import { queryParams } from '../../middleware/validate.ts';
import { exportService } from './export.service.ts';

/** GET /api/readings/export: readings of chosen tanks as CSV, for everyone signed in. */
export function exportRouter(): Router {
  const r = Router();
  r.get('/export', requireSignIn, async (req, res) => {
    const q = queryParams(exportQuerySchema, req);
    const plan = await exportService.plan(q);
    res.status(200).attachment(plan.fileName).type(CSV_TYPE);
    res.setHeader('Cache-Control', 'no-store');
    try {
      const complete = await exportService.stream(q, plan, res);
      if (!complete) logger.info({ userId: req.user!.id }, 'readings export aborted by the client');
    } catch (err) {
      // Headers are gone once the first row left: cut the response so the file is visibly incomplete.
      if (!res.headersSent) throw err;
      res.destroy(err as Error);
    }
  });
  return r;
}
