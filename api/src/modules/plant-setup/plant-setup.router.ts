import { Router } from 'express';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import {
  circuitInputSchema, circuitUpdateSchema, gatewayInputSchema, gatewayUpdateSchema, probeInputSchema, probeUpdateSchema,
  retireSchema, siteInputSchema, siteUpdateSchema, tankInputSchema, tankUpdateSchema,
} from '../../../../shared/schemas/plant-setup.ts';
import { AppError } from '../../lib/app-error.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body, params } from '../../middleware/validate.ts';
import type { Bus } from '../../realtime/bus.ts';
import type { Entity } from './plant-setup.repository.ts';
import { createPlantSetupService } from './plant-setup.service.ts';

/**
 * Plant setup: everyone reads; admins change sites, circuits and tanks; admins and engineers
 * change probes and gateways. Each change carries a reason into the audit trail.
 */
export function plantSetupRouter(bus?: Bus): Router {
  const r = Router();
  const service = createPlantSetupService(() => bus?.brokerHealth?.gateways ?? null);
  // The ingest worker's probe cache reloads at once instead of at its next timer.
  const changed = () => void bus?.invalidateProbeCache().catch(() => undefined);
  const admin = requireRole('admin');
  const field = requireRole('admin', 'engineer');
  const id = (req: Parameters<Parameters<typeof r.get>[1]>[0]) => params(idParamSchema, req).id;
  const found = <T>(v: T | null, what: string): T => {
    if (!v) throw AppError.notFound(what);
    return v;
  };

  r.get('/', requireSignIn, async (_req, res) => {
    res.json(await service.all());
  });

  r.post('/sites', admin, async (req, res) => {
    res.status(201).json({ site: await service.createSite(body(siteInputSchema, req), req.user!.id) });
    changed();
  });
  r.patch('/sites/:id', admin, async (req, res) => {
    res.json({ site: found(await service.updateSite(id(req), body(siteUpdateSchema, req), req.user!.id), 'Site') });
    changed();
  });
  r.post('/circuits', admin, async (req, res) => {
    res.status(201).json({ circuit: await service.createCircuit(body(circuitInputSchema, req), req.user!.id) });
  });
  r.patch('/circuits/:id', admin, async (req, res) => {
    res.json({ circuit: found(await service.updateCircuit(id(req), body(circuitUpdateSchema, req), req.user!.id), 'Circuit') });
  });
  r.post('/tanks', admin, async (req, res) => {
    res.status(201).json({ tank: await service.createTank(body(tankInputSchema, req), req.user!.id) });
    changed();
  });
  r.patch('/tanks/:id', admin, async (req, res) => {
    res.json({ tank: found(await service.updateTank(id(req), body(tankUpdateSchema, req), req.user!.id), 'Tank') });
  });
  r.post('/probes', field, async (req, res) => {
    res.status(201).json({ probe: await service.createProbe(body(probeInputSchema, req), req.user!.id) });
    changed();
  });
  r.patch('/probes/:id', field, async (req, res) => {
    res.json({ probe: found(await service.updateProbe(id(req), body(probeUpdateSchema, req), req.user!.id), 'Probe') });
    changed();
  });
  r.post('/gateways', field, async (req, res) => {
    res.status(201).json(await service.createGateway(body(gatewayInputSchema, req), req.user!.id));
  });
  r.patch('/gateways/:id', field, async (req, res) => {
    res.json({ gateway: found(await service.updateGateway(id(req), body(gatewayUpdateSchema, req), req.user!.id), 'Gateway') });
  });
  r.post('/gateways/:id/rotate', field, async (req, res) => {
    res.json(await service.rotateGateway(id(req), body(retireSchema, req).reason, req.user!.id));
  });

  const retireRoutes: Array<[string, Entity, typeof admin]> = [
    ['sites', 'site', admin], ['circuits', 'circuit', admin], ['tanks', 'tank', admin], ['probes', 'probe', field], ['gateways', 'gateway', field],
  ];
  for (const [path, entity, guard] of retireRoutes) {
    r.post(`/${path}/:id/retire`, guard, async (req, res) => {
      res.json({ [entity]: await service.retire(entity, id(req), body(retireSchema, req).reason, req.user!.id) });
      changed();
    });
  }
  return r;
}
