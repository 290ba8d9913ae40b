import { Router } from 'express';
import { DEAD_LETTER_EXPORT_COLUMNS, deadLetterExportQuerySchema, deadLetterQuerySchema, type DeadLetterPage } from '../../../../shared/schemas/dead-letters.ts';
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
  // The screen's filters, every matching dead letter (the screen shows the newest 100).
  r.get('/export', allowed, async (req, res) => {
    const q = queryParams(deadLetterExportQuerySchema, req);
    const source = await deadLettersService.openExport(q);
    await sendCsvRows(res, deadLettersService.exportFileName(q), DEAD_LETTER_EXPORT_COLUMNS, source, deadLettersService.exportRow);
  });
  return r;
}
