import { CSV_TYPE } from '../../lib/csv.ts';
import { Router } from 'express';
import { ACK_ROLES, SERVICE_ROLES, SHELVE_GATE } from '../../../../shared/alarms/roles.ts';
import {
  acknowledgeSchema, activeQuerySchema, commentSchema, eventsAfterQuerySchema, figuresQuerySchema, historyQuerySchema,
  oosSchema, returnToServiceSchema, shelveSchema,
} from '../../../../shared/schemas/alarms.ts';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body, params, queryParams } from '../../middleware/validate.ts';
import { alarmsService as svc } from './alarms.service.ts';
import { definitionsRouter } from './definitions.router.ts';

/** Everyone signed in sees and comments; who acknowledges, shelves and takes out of service: shared/alarms/roles.ts. */

export function alarmsRouter(): Router {
  const r = Router();
  r.use(requireSignIn);
  r.get('/active', async (req, res) => {
    res.json(await svc.active(queryParams(activeQuerySchema, req)));
  });
  r.get('/summary', async (_req, res) => {
    res.json(await svc.summary());
  });
  r.get('/events', async (req, res) => {
    const q = queryParams(eventsAfterQuerySchema, req);
    res.json(await svc.eventsAfter(q.after, q.limit));
  });
  r.get('/history', async (req, res) => {
    res.json(await svc.history(queryParams(historyQuerySchema, req)));
  });
  r.get('/history/export', async (req, res) => {
    const csv = await svc.historyCsv(queryParams(historyQuerySchema, req));
    res.type(CSV_TYPE).attachment(`alarm-history-${new Date().toISOString().slice(0, 10)}.csv`).send(csv);
  });
  r.get('/figures', async (req, res) => {
    const q = queryParams(figuresQuerySchema, req);
    res.json(await svc.figures(q.from, q.to, q.site));
  });
  r.get('/instances/:id', async (req, res) => {
    res.json(await svc.instance(params(idParamSchema, req).id));
  });
  r.post('/instances/:id/acknowledge', requireRole(...ACK_ROLES), async (req, res) => {
    res.json(await svc.acknowledge(params(idParamSchema, req).id, req.user!, body(acknowledgeSchema, req).comment));
  });
  // Operators pass this gate; the service applies the site's shelve setting.
  r.post('/instances/:id/shelve', requireRole(...SHELVE_GATE), async (req, res) => {
    res.json(await svc.shelve(params(idParamSchema, req).id, req.user!, body(shelveSchema, req)));
  });
  r.post('/instances/:id/unshelve', requireRole(...ACK_ROLES), async (req, res) => {
    res.json(await svc.unshelve(params(idParamSchema, req).id, req.user!, body(acknowledgeSchema, req).comment));
  });
  r.post('/instances/:id/comment', async (req, res) => {
    res.status(201).json(await svc.comment(params(idParamSchema, req).id, req.user!, body(commentSchema, req).text));
  });
  r.post('/tanks/:id/acknowledge', requireRole(...ACK_ROLES), async (req, res) => {
    res.json(await svc.acknowledgeTank(params(idParamSchema, req).id, req.user!, body(acknowledgeSchema, req).comment));
  });
  r.post('/definitions/:id/out-of-service', requireRole(...SERVICE_ROLES), async (req, res) => {
    res.json(await svc.removeFromService(params(idParamSchema, req).id, req.user!, body(oosSchema, req)));
  });
  r.post('/definitions/:id/return-to-service', requireRole(...SERVICE_ROLES), async (req, res) => {
    res.json(await svc.returnToService(params(idParamSchema, req).id, req.user!, body(returnToServiceSchema, req).comment));
  });
  definitionsRouter(r);
  return r;
}
