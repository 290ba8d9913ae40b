import { QueryTypes, type Model, type ModelStatic, type Transaction } from 'sequelize';
import type { DeadLetterKind } from '../../../../shared/schemas/dead-letters.ts';
import type { SetupCircuit, SetupGateway, SetupProbe, SetupSite, SetupTank } from '../../../../shared/schemas/plant-setup.ts';
import { Calibration, Circuit, Device, Probe, Site, Tank } from '../../db/models.ts';
import { writeAudit } from '../audit.repository.ts';

const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);

export const toSite = (s: Site): SetupSite => ({ id: s.id, tag: s.tag, name: s.name, timeZone: s.timeZone, retiredAt: iso(s.retiredAt) });
export const toCircuit = (c: Circuit): SetupCircuit => ({
  id: c.id, siteId: c.siteId, tag: c.tag, name: c.name, process: c.process, position: c.position + 1, retiredAt: iso(c.retiredAt),
});
export const toTank = (t: Tank): SetupTank => ({
  id: t.id, circuitId: t.circuitId, tag: t.tag, name: t.name, position: t.position + 1, volumeM3: t.volumeM3,
  feTotalGPerL: t.feTotalGPerL ?? null, retiredAt: iso(t.retiredAt),
});
export const toProbe = (p: Probe, replacements: SetupProbe['replacements'] = []): SetupProbe => ({
  id: p.id, tankId: p.tankId, tag: p.tag, referenceId: p.referenceId, referenceE25V: p.referenceE25V, referenceCoeffVPerK: p.referenceCoeffVPerK,
  toleranceMv: p.toleranceMv, intervalS: p.intervalS, installedAt: iso(p.installedAt)!, retiredAt: iso(p.retiredAt), replacements,
});
export const toGateway = (d: Device): Omit<SetupGateway, 'live' | 'deadLettersByKind'> => ({
  id: d.id, siteId: d.siteId, username: d.username, name: d.name ?? null, enabled: d.enabled, retiredAt: iso(d.retiredAt),
});

export type Entity = 'site' | 'circuit' | 'tank' | 'probe' | 'gateway';
const MODELS: Record<Entity, ModelStatic<Model>> = { site: Site, circuit: Circuit, tank: Tank, probe: Probe, gateway: Device };
const VIEWS: Record<Entity, (m: never) => object> = { site: toSite, circuit: toCircuit, tank: toTank, probe: toProbe, gateway: toGateway };
const view = (entity: Entity, m: Model) => (VIEWS[entity] as (m: Model) => object)(m);

type Change = { entity: Entity; userId: number; reason?: string | null };

/**
 * Every write here goes with its audit entry (who, when, before, after, reason) in one
 * transaction. Nothing is deleted: retiring sets retired_at, and a retired probe stops being active.
 */
export const plantSetupRepository = {
  async all() {
    const [sites, circuits, tanks, probes, devices, replacements] = await Promise.all([
      Site.findAll({ order: [['tag', 'ASC']] }),
      Circuit.findAll({ order: [['siteId', 'ASC'], ['position', 'ASC']] }),
      Tank.findAll({ order: [['circuitId', 'ASC'], ['position', 'ASC']] }),
      Probe.findAll({ order: [['tankId', 'ASC'], ['id', 'ASC']] }),
      Device.findAll({ order: [['username', 'ASC']] }),
      Site.sequelize!.query<{ probe_id: number; part: string; replaced_at: Date; reason: string }>(
        'SELECT probe_id, part, replaced_at, reason FROM probe_replacements ORDER BY replaced_at', { type: QueryTypes.SELECT }),
    ]);
    const byProbe = new Map<number, SetupProbe['replacements']>();
    for (const r of replacements) {
      byProbe.set(r.probe_id, [...(byProbe.get(r.probe_id) ?? []), { part: r.part, replacedAt: iso(r.replaced_at)!, reason: r.reason }]);
    }
    return {
      sites: sites.map(toSite), circuits: circuits.map(toCircuit), tanks: tanks.map(toTank),
      probes: probes.map((p) => toProbe(p, byProbe.get(p.id))), gateways: devices.map(toGateway),
    };
  },

  /** Dead letters the broker attributed to each gateway, by kind (counted in the database). */
  async deadLettersByGateway(): Promise<Map<string, Partial<Record<DeadLetterKind, number>>>> {
    const rows = await Site.sequelize!.query<{ gateway: string; reason_kind: DeadLetterKind; n: number }>(
      'SELECT gateway, reason_kind, COUNT(*) AS n FROM dead_letters WHERE gateway IS NOT NULL GROUP BY gateway, reason_kind',
      { type: QueryTypes.SELECT });
    const out = new Map<string, Partial<Record<DeadLetterKind, number>>>();
    for (const r of rows) out.set(r.gateway, { ...out.get(r.gateway), [r.reason_kind]: Number(r.n) });
    return out;
  },

  async find(entity: Entity, id: number) {
    const m = await MODELS[entity].findByPk(id);
    return m ? view(entity, m) : null;
  },

  async siteTagOf(siteId: number): Promise<string | null> {
    return (await Site.findByPk(siteId))?.tag ?? null;
  },

  async countActiveChildren(entity: Entity, id: number): Promise<number> {
    const active = { retiredAt: null };
    if (entity === 'site') {
      return (await Circuit.count({ where: { siteId: id, ...active } })) + (await Device.count({ where: { siteId: id, ...active } }));
    }
    if (entity === 'circuit') return Tank.count({ where: { circuitId: id, ...active } });
    if (entity === 'tank') return Probe.count({ where: { tankId: id, ...active } });
    return 0;
  },

  async tagTaken(entity: 'site' | 'tank' | 'probe', tag: string): Promise<boolean> {
    return (await (MODELS[entity] as ModelStatic<Model>).count({ where: { tag } })) > 0;
  },

  async create<T extends object>(c: Change, values: Record<string, unknown>, extra?: (row: Model, t: Transaction) => Promise<void>): Promise<T> {
    return Site.sequelize!.transaction(async (transaction) => {
      const row = await MODELS[c.entity].create(values, { transaction });
      await extra?.(row, transaction);
      const after = view(c.entity, row);
      await writeAudit({ userId: c.userId, action: `${c.entity}.create`, entity: c.entity, entityId: row.get('id') as number, after: redact(after), reason: c.reason }, transaction);
      return after as T;
    });
  },

  async update<T extends object>(c: Change, id: number, values: Record<string, unknown>, action = 'update'): Promise<T | null> {
    return Site.sequelize!.transaction(async (transaction) => {
      const row = await MODELS[c.entity].findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
      if (!row) return null;
      const before = view(c.entity, row);
      await row.update(values, { transaction });
      const after = view(c.entity, row);
      await writeAudit({ userId: c.userId, action: `${c.entity}.${action}`, entity: c.entity, entityId: id, before: redact(before), after: redact(after), reason: c.reason }, transaction);
      return after as T;
    });
  },

  /** The commissioning calibration of a new tank (version 1). */
  async addStartingCalibration(tankId: number, formalPotentialV: number, reason: string, userId: number, transaction: Transaction): Promise<void> {
    await Calibration.create({ tankId, version: 1, formalPotentialV, formalCoeffVPerK: 0, validFrom: new Date(), reason, createdBy: userId }, { transaction });
  },
};

/** Password hashes never reach the audit trail. */
function redact(o: object): object {
  const { passwordHash: _h, ...rest } = o as { passwordHash?: string };
  return rest;
}
