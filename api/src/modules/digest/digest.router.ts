import { Router } from 'express';
import { digestExportQuerySchema, digestQuerySchema } from '../../../../shared/schemas/digest.ts';
import { csvAttachment, csvText } from '../../lib/csv.ts';
import { requireSignIn } from '../../middleware/auth.ts';
import { queryParams } from '../../middleware/validate.ts';
import { digestFileName, digestTableRows } from './digest-csv.ts';
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
  // One table of the same digest the screen shows; a digest is at most a month of one site, so it is built whole.
  r.get('/export', requireSignIn, async (req, res) => {
    const { table, ...q } = queryParams(digestExportQuerySchema, req);
    const d = await digestService.digest(q);
    csvAttachment(res, digestFileName(d, table));
    // Summaries quote Fe²⁺, dashes and arrows: the byte-order mark keeps them readable in spreadsheets.
    res.send(csvText(digestTableRows(d, table), { bom: true }));
  });
  return r;
}
