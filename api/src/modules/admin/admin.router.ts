import { Router } from 'express';
import { AppError } from '../../lib/app-error.ts';
import { requireRole } from '../../middleware/auth.ts';
import { body } from '../../middleware/validate.ts';
import type { Bus } from '../../realtime/bus.ts';
import { simCommandSchema } from '../../../../shared/schemas/simulator.ts';
import { supervisedParts } from './supervisor-status.ts';
import { Site } from '../../db/models.ts';
import { ingestWatchView } from '../system-alarms/ingest-watch.service.ts';

/** Admin-only: simulator faults for demos and training, ingest health. */
export function adminRouter(bus?: Bus, dataDir = '.data'): Router {
  const r = Router();
  r.use(requireRole('admin'));
  const needBus = () => {
    if (!bus?.connected) throw new AppError(503, 'broker-unavailable', 'The broker is not reachable from the API right now');
    return bus;
  };
  r.get('/simulator', (_req, res) => {
    res.json({ faults: bus?.simState ?? [] });
  });
  r.post('/simulator', async (req, res) => {
    const cmd = body(simCommandSchema, req);
    await needBus().simCommand(cmd);
    res.status(202).json({ accepted: cmd });
  });
  r.get('/ingest-health', async (_req, res) => {
    // null until the worker (the embedded broker) has published its first snapshot.
    const [parts, watch] = await Promise.all([supervisedParts(dataDir), ingestWatchView(Site.sequelize!)]);
    res.json({ health: bus?.ingestHealth ?? null, broker: bus?.brokerHealth ?? null, parts, ...watch });
  });
  return r;
}
