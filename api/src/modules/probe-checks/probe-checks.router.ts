import { Router } from 'express';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import {
  checkIntervalSchema, probeCheckSchema, probeChecksQuerySchema, probeReplacementSchema,
} from '../../../../shared/schemas/probe-checks.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body, params, queryParams } from '../../middleware/validate.ts';
import type { Bus } from '../../realtime/bus.ts';
import { probeChecksService } from './probe-checks.service.ts';

/** Probe checks, due dates and the replacement log: everyone reads; metallurgists and admins record. */
export function probeChecksRouter(bus?: Bus): Router {
  const r = Router();
  const write = requireRole('metallurgist', 'admin');
  r.get('/', requireSignIn, async (req, res) => {
    res.json({ checks: await probeChecksService.list(queryParams(probeChecksQuerySchema, req)) });
  });
  r.post('/', write, async (req, res) => {
    res.status(201).json({ check: await probeChecksService.record(body(probeCheckSchema, req), req.user!.id, bus) });
  });
  r.get('/schedule', requireSignIn, async (_req, res) => {
    res.json({ probes: await probeChecksService.due() });
  });
  r.put('/schedule/:id', write, async (req, res) => {
    const { id } = params(idParamSchema, req);
    const input = body(checkIntervalSchema, req);
    await probeChecksService.setInterval(id, input.intervalDays, input.reason, req.user!.id);
    res.json({ probe: (await probeChecksService.due()).find((d) => d.probeId === id) ?? null });
  });
  r.get('/replacements', requireSignIn, async (req, res) => {
    res.json({ replacements: await probeChecksService.replacements(queryParams(probeChecksQuerySchema, req)) });
  });
  r.post('/replacements', write, async (req, res) => {
    res.status(201).json({ replacement: await probeChecksService.replace(body(probeReplacementSchema, req), req.user!.id, bus) });
  });
  return r;
}
