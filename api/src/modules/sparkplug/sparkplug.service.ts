import type {
  SparkplugGroupCreate, SparkplugMappingCreate, SparkplugSetup,
} from '../../../../shared/schemas/sparkplug.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import type { Bus } from '../../realtime/bus.ts';
import { writeAudit } from '../audit.repository.ts';
import { sparkplugRepository as repo } from './sparkplug.repository.ts';

const field = (path: string, message: string) => AppError.badRequest(message, { errors: [{ path, message }] });
// The ingest worker reloads its mapping when told, instead of at its next 10 s refresh.
const announce = (bus?: Bus) => bus?.invalidateProbeCache().catch((err: Error) => logger.warn({ err: err.message }, 'could not announce the Sparkplug change'));

export const sparkplugService = {
  async setup(hostId: string): Promise<SparkplugSetup> {
    const [groups, mappings, events] = await Promise.all([repo.groups(), repo.mappings(), repo.events(50)]);
    return { hostId, groups, mappings, events };
  },

  async createGroup(g: SparkplugGroupCreate, userId: number, bus?: Bus): Promise<number> {
    if (!(await repo.siteExists(g.siteId))) throw field('siteId', 'No such site');
    if (await repo.groupByName(g.groupId)) throw AppError.conflict(`Group ${g.groupId} is already assigned to a site`);
    const id = await repo.createGroup(g);
    await writeAudit({ userId, action: 'sparkplug.group.create', entity: 'sparkplug_group', entityId: id, after: g });
    await announce(bus);
    return id;
  },

  async deleteGroup(id: number, userId: number, bus?: Bus): Promise<void> {
    if (!(await repo.deleteGroup(id))) throw AppError.notFound('Sparkplug group');
    await writeAudit({ userId, action: 'sparkplug.group.delete', entity: 'sparkplug_group', entityId: id });
    await announce(bus);
  },

  async createMapping(m: SparkplugMappingCreate, userId: number, bus?: Bus): Promise<number> {
    const group = await repo.groupByName(m.groupId);
    if (!group) throw field('groupId', 'Add this group to a site first');
    const probeSite = await repo.siteOfProbe(m.probeId);
    if (probeSite === null) throw field('probeId', 'No such probe');
    // Site rights: a group's edge nodes feed only that site's probes.
    if (probeSite !== group.siteId) throw field('probeId', 'This probe belongs to another site than the group');
    const id = await repo.createMapping(group.id, m);
    if (id === null) throw AppError.conflict('This metric, or this probe\'s ' + (m.role === 'orp' ? 'ORP' : 'temperature') + ', is already mapped');
    await writeAudit({ userId, action: 'sparkplug.mapping.create', entity: 'sparkplug_metric', entityId: id, after: m });
    await announce(bus);
    return id;
  },

  async deleteMapping(id: number, userId: number, bus?: Bus): Promise<void> {
    if (!(await repo.deleteMapping(id))) throw AppError.notFound('Sparkplug mapping');
    await writeAudit({ userId, action: 'sparkplug.mapping.delete', entity: 'sparkplug_metric', entityId: id });
    await announce(bus);
  },
};
