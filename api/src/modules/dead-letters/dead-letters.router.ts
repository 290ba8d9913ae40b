import { Router } from 'express';
import { deadLetterExportQuerySchema, deadLetterQuerySchema, type DeadLetterPage } from '../../../../shared/schemas/dead-letters.ts';
import { sendCsvRows } from '../../lib/csv.ts';
import { requireRole } from '../../middleware/auth.ts';
import { queryParams } from '../../middleware/validate.ts';
import { deadLettersService } from './dead-letters.service.ts';

/** Dead letters and conflicts, for the people who commission and look after devices. */
export function deadLettersRouter(opts: { retentionDays: number }): Router {
  const r = Router();
  const allowed = requireRole('admin', 'engineer');
  r.get('/', allowed, async (req, res) => {
    const page: DeadLetterPage = await deadLettersService.page(queryParams(deadLetterQuerySchema, req), opts.retentionDays);
    res.json(page);
  });
  // The screen's filters, every matching dead letter or conflict (the screen shows the newest 100 of each).
  r.get('/export', allowed, async (req, res) => {
    await sendCsvRows(res, await deadLettersService.export(queryParams(deadLetterExportQuerySchema, req)));
  });
  return r;
}
