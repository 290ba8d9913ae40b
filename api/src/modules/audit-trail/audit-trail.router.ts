import { Router } from 'express';
import { auditExportQuerySchema, auditQuerySchema } from '../../../../shared/schemas/audit.ts';
import { sendCsvRows } from '../../lib/csv.ts';
import { requireRole } from '../../middleware/auth.ts';
import { queryParams } from '../../middleware/validate.ts';
import { auditTrailService as svc } from './audit-trail.service.ts';

/** /api/audit: who changed what, when, from what to what and why; for admins, who look after people and the plant. */
export function auditTrailRouter(): Router {
  const r = Router();
  const allowed = requireRole('admin');
  r.get('/', allowed, async (req, res) => {
    res.json(await svc.page(queryParams(auditQuerySchema, req)));
  });
  // The screen's filters, every matching entry (the screen shows the newest 100).
  r.get('/export', allowed, async (req, res) => {
    await sendCsvRows(res, await svc.export(queryParams(auditExportQuerySchema, req)));
  });
  return r;
}
