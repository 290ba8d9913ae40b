import { Router } from 'express';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import {
  closeShiftSchema, logEntryEditSchema, logEntryInputSchema, shiftListQuerySchema, shiftLogQuerySchema, shiftPatternInputSchema,
} from '../../../../shared/schemas/shifts.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body, params, queryParams } from '../../middleware/validate.ts';
import { shiftLogService } from './shift-log.service.ts';
import { shiftsService } from './shifts.service.ts';

/** /api/shifts: the site's shift pattern, the list of shifts and the handover. */
export function shiftsRouter(): Router {
  const r = Router();
  r.get('/pattern', requireSignIn, async (req, res) => {
    res.json({ pattern: await shiftsService.pattern(queryParams(shiftLogQuerySchema, req).siteId) });
  });
  // A site setting, so plant setup (admin) owns it.
  r.put('/pattern', requireRole('admin'), async (req, res) => {
    res.json({ pattern: await shiftsService.setPattern(body(shiftPatternInputSchema, req), req.user!) });
  });
  r.get('/', requireSignIn, async (req, res) => {
    const q = queryParams(shiftListQuerySchema, req);
    res.json(await shiftsService.list(q.siteId, q.count));
  });
  r.post('/close', requireRole('supervisor'), async (req, res) => {
    res.json({ shift: await shiftsService.close(body(closeShiftSchema, req), req.user!) });
  });
  return r;
}

/** /api/shift-log: everyone signed in writes; only authors reword, and only while the shift is open. */
export function shiftLogRouter(): Router {
  const r = Router();
  r.use(requireSignIn);
  r.get('/', async (req, res) => {
    const q = queryParams(shiftLogQuerySchema, req);
    res.json(await shiftLogService.log(q.siteId, q.at));
  });
  r.post('/entries', async (req, res) => {
    res.status(201).json({ entry: await shiftLogService.add(body(logEntryInputSchema, req), req.user!) });
  });
  r.patch('/entries/:id', async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json({ entry: await shiftLogService.edit(id, body(logEntryEditSchema, req).body, req.user!) });
  });
  return r;
}
