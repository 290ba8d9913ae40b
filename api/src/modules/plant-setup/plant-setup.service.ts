import { randomBytes } from 'node:crypto';
import bcrypt from 'bcryptjs';
import { REFERENCE_ELECTRODES } from '../../../../shared/redox/index.ts';
import type { GatewayLive } from '../../../../shared/schemas/ingest-health.ts';
import {
  CUSTOM_REFERENCE, type CircuitInput, type CircuitUpdate, type GatewayInput, type GatewaySecret, type GatewayUpdate, type PlantSetup,
  type ProbeInput, type ProbeUpdate, type SetupGateway, type SiteInput, type SiteUpdate, type TankInput, type TankUpdate,
} from '../../../../shared/schemas/plant-setup.ts';
import { AppError } from '../../lib/app-error.ts';
import { BCRYPT_COST } from '../auth/auth.service.ts';
import { plantSetupRepository as repo, type Entity } from './plant-setup.repository.ts';

const fieldError = (field: string, message: string) => new AppError(400, 'validation', message, { errors: [{ path: field, message }] });
const notFound = (what: string) => AppError.notFound(what);

/** Reference values for a probe: a listed electrode's own, or the custom pair given. */
function referenceValues(input: { referenceId?: string; referenceE25V?: number; referenceCoeffVPerK?: number }) {
  if (input.referenceId === undefined) return {};
  if (input.referenceId === CUSTOM_REFERENCE) {
    return { referenceId: CUSTOM_REFERENCE, referenceE25V: input.referenceE25V!, referenceCoeffVPerK: input.referenceCoeffVPerK! };
  }
  const ref = REFERENCE_ELECTRODES.find((r) => r.id === input.referenceId);
  if (!ref) throw fieldError('referenceId', 'Pick a reference electrode from the list, or custom');
  return { referenceId: ref.id, referenceE25V: ref.e25V, referenceCoeffVPerK: ref.coeffVPerK };
}

/** A gateway password: 24 random bytes, URL-safe, shown once. */
const newPassword = () => randomBytes(24).toString('base64url');

const defined = (o: Record<string, unknown>) => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined));

export type GatewayStatus = () => GatewayLive[] | null;

export function createPlantSetupService(gatewayStatus: GatewayStatus = () => null) {
  const requireActive = async (entity: Entity, id: number, label: string) => {
    const row = (await repo.find(entity, id)) as { retiredAt: string | null } | null;
    if (!row) throw notFound(label);
    if (row.retiredAt) throw fieldError(`${entity}Id`, `That ${label.toLowerCase()} is retired`);
    return row;
  };
  const uniqueTag = async (entity: 'site' | 'tank' | 'probe', tag: string) => {
    if (await repo.tagTaken(entity, tag)) throw AppError.conflict(`The tag ${tag} is already used by another ${entity}`);
  };
  const withStatus = async (gateways: Awaited<ReturnType<typeof repo.all>>['gateways']): Promise<SetupGateway[]> => {
    const live = new Map((gatewayStatus() ?? []).map((g) => [g.username, g]));
    const letters = await repo.deadLettersByGateway();
    return gateways.map((g) => ({ ...g, live: live.get(g.username) ?? null, deadLettersByKind: letters.get(g.username) ?? {} }));
  };
  const retire = async (entity: Entity, id: number, label: string, children: string, userId: number, reason: string) => {
    const row = (await repo.find(entity, id)) as { retiredAt: string | null } | null;
    if (!row) throw notFound(label);
    if (row.retiredAt) throw AppError.conflict(`That ${label.toLowerCase()} is already retired`);
    if ((await repo.countActiveChildren(entity, id)) > 0) throw AppError.conflict(`Retire its ${children} first`);
    const values: Record<string, unknown> = { retiredAt: new Date() };
    if (entity === 'probe') values.active = false;
    if (entity === 'gateway') values.enabled = false;
    return repo.update({ entity, userId, reason }, id, values, 'retire');
  };

  return {
    async all(): Promise<PlantSetup> {
      const all = await repo.all();
      return { ...all, gateways: await withStatus(all.gateways) };
    },

    async createSite(input: SiteInput, userId: number) {
      await uniqueTag('site', input.tag);
      return repo.create({ entity: 'site', userId, reason: input.reason }, { tag: input.tag, name: input.name, timeZone: input.timeZone });
    },
    async updateSite(id: number, input: SiteUpdate, userId: number) {
      await requireActive('site', id, 'Site');
      return repo.update({ entity: 'site', userId, reason: input.reason }, id, defined({ name: input.name, timeZone: input.timeZone }));
    },

    async createCircuit(input: CircuitInput, userId: number) {
      await requireActive('site', input.siteId, 'Site');
      return repo.create({ entity: 'circuit', userId, reason: input.reason }, {
        siteId: input.siteId, tag: input.tag, name: input.name, process: input.process, position: input.position - 1,
      });
    },
    async updateCircuit(id: number, input: CircuitUpdate, userId: number) {
      await requireActive('circuit', id, 'Circuit');
      return repo.update({ entity: 'circuit', userId, reason: input.reason }, id,
        defined({ name: input.name, process: input.process, position: input.position === undefined ? undefined : input.position - 1 }));
    },

    async createTank(input: TankInput, userId: number) {
      await requireActive('circuit', input.circuitId, 'Circuit');
      await uniqueTag('tank', input.tag);
      return repo.create({ entity: 'tank', userId, reason: input.reason }, {
        circuitId: input.circuitId, tag: input.tag, name: input.name, position: input.position - 1, volumeM3: input.volumeM3,
        feTotalGPerL: input.feTotalGPerL ?? null, bandLow: input.bandLow, bandHigh: input.bandHigh, bandTarget: null,
      }, (row, t) => repo.addStartingCalibration(row.get('id') as number, input.formalPotentialV, 'Starting formal potential at commissioning', userId, t));
    },
    async updateTank(id: number, input: TankUpdate, userId: number) {
      await requireActive('tank', id, 'Tank');
      return repo.update({ entity: 'tank', userId, reason: input.reason }, id, defined({
        name: input.name, position: input.position === undefined ? undefined : input.position - 1, volumeM3: input.volumeM3, feTotalGPerL: input.feTotalGPerL,
      }));
    },

    async createProbe(input: ProbeInput, userId: number) {
      await requireActive('tank', input.tankId, 'Tank');
      await uniqueTag('probe', input.tag);
      if ((await repo.countActiveChildren('tank', input.tankId)) > 0) throw AppError.conflict('That tank already has a probe in service: retire it first');
      return repo.create({ entity: 'probe', userId, reason: input.reason }, {
        tankId: input.tankId, tag: input.tag, ...referenceValues(input), toleranceMv: input.toleranceMv, intervalS: input.intervalS,
        installedAt: new Date(input.installedAt),
      });
    },
    async updateProbe(id: number, input: ProbeUpdate, userId: number) {
      await requireActive('probe', id, 'Probe');
      return repo.update({ entity: 'probe', userId, reason: input.reason }, id,
        defined({ ...referenceValues(input), toleranceMv: input.toleranceMv, intervalS: input.intervalS }));
    },

    async createGateway(input: GatewayInput, userId: number): Promise<GatewaySecret> {
      await requireActive('site', input.siteId, 'Site');
      const password = newPassword();
      try {
        const g = await repo.create<Omit<SetupGateway, 'live' | 'deadLettersByKind'>>({ entity: 'gateway', userId, reason: input.reason }, {
          siteId: input.siteId, username: input.username, name: input.name ?? null, passwordHash: await bcrypt.hash(password, BCRYPT_COST),
        });
        return { gateway: { ...g, live: null, deadLettersByKind: {} }, password };
      } catch (err) {
        if ((err as Error).name === 'SequelizeUniqueConstraintError') throw AppError.conflict(`The username ${input.username} is taken (usernames differ by more than case)`);
        throw err;
      }
    },
    async updateGateway(id: number, input: GatewayUpdate, userId: number) {
      await requireActive('gateway', id, 'Gateway');
      return repo.update({ entity: 'gateway', userId, reason: input.reason }, id, defined({ name: input.name, enabled: input.enabled }));
    },
    async rotateGateway(id: number, reason: string, userId: number): Promise<GatewaySecret> {
      await requireActive('gateway', id, 'Gateway');
      const password = newPassword();
      const g = await repo.update<Omit<SetupGateway, 'live' | 'deadLettersByKind'>>({ entity: 'gateway', userId, reason }, id,
        { passwordHash: await bcrypt.hash(password, BCRYPT_COST) }, 'rotate-password');
      return { gateway: { ...g!, live: null, deadLettersByKind: {} }, password };
    },

    retire: (entity: Entity, id: number, reason: string, userId: number) => {
      const labels: Record<Entity, [string, string]> = {
        site: ['Site', 'circuits and gateways'], circuit: ['Circuit', 'tanks'], tank: ['Tank', 'probe'], probe: ['Probe', ''], gateway: ['Gateway', ''],
      };
      return retire(entity, id, labels[entity][0], labels[entity][1], userId, reason);
    },
  };
}

export type PlantSetupService = ReturnType<typeof createPlantSetupService>;
