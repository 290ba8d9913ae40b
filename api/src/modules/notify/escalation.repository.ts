import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { AlarmView } from '../../../../shared/schemas/alarms.ts';
import { INSTANCE_SELECT } from '../alarms/alarms.repository.ts';
import { toAlarmView, type InstanceRow } from '../alarms/views.ts';

/** What escalation reads: the alarms waiting for acknowledgement and the facts its mail tells. */
export type TankFacts = { siteName: string; timeZone: string; band: { low: number; high: number } };
export type LatestReading = { ts: string; ratio: number; orpMv: number; tempC: number };

export const escalationRepository = {
  /** Open alarms waiting for acknowledgement, oldest first. */
  async unacknowledged(sequelize: Sequelize): Promise<AlarmView[]> {
    const rows = await sequelize.query<InstanceRow>(
      `${INSTANCE_SELECT} WHERE i.open_definition_id IS NOT NULL AND i.state = 'unacknowledged' AND i.unack_since IS NOT NULL ORDER BY i.id`,
      { type: QueryTypes.SELECT });
    return rows.map(toAlarmView);
  },

  /** Under the alarm lock: whether the alarm is still open and unacknowledged. */
  async stillUnacknowledged(sequelize: Sequelize, t: Transaction, instanceId: number): Promise<boolean> {
    const [current] = await sequelize.query<{ state: string; open_definition_id: number | null }>(
      'SELECT state, open_definition_id FROM alarm_instances WHERE id = ? FOR UPDATE', { replacements: [instanceId], type: QueryTypes.SELECT, transaction: t });
    return !!current && current.open_definition_id !== null && current.state === 'unacknowledged';
  },

  async tankFacts(sequelize: Sequelize, tankId: number): Promise<TankFacts> {
    const [f] = await sequelize.query<{ site_name: string; time_zone: string; band_low: number; band_high: number }>(
      'SELECT s.name AS site_name, s.time_zone, t.band_low, t.band_high FROM tanks t JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id WHERE t.id = ?',
      { replacements: [tankId], type: QueryTypes.SELECT });
    return { siteName: f.site_name, timeZone: f.time_zone, band: { low: f.band_low, high: f.band_high } };
  },

  /** A plant-wide alarm's mail: every site's name, and the first site's time zone (UTC with no site yet). */
  async plantFacts(sequelize: Sequelize): Promise<Omit<TankFacts, 'band'>> {
    const sites = await sequelize.query<{ name: string; time_zone: string }>('SELECT name, time_zone FROM sites ORDER BY id', { type: QueryTypes.SELECT });
    return { siteName: sites.length ? sites.map((s) => s.name).join(', ') : 'this plant', timeZone: sites[0]?.time_zone ?? 'UTC' };
  },

  /** The newest reading of the tank's active probe, or null when it has none. */
  async latestReading(sequelize: Sequelize, tankId: number): Promise<LatestReading | null> {
    const [r] = await sequelize.query<{ ts: Date; ratio: number; orp_mv: number; temp_c: number }>(
      'SELECT r.ts, r.ratio, r.orp_mv, r.temp_c FROM probes p JOIN readings r ON r.probe_id = p.id WHERE p.tank_id = ? AND p.active = 1 ORDER BY r.ts DESC LIMIT 1',
      { replacements: [tankId], type: QueryTypes.SELECT });
    return r ? { ts: new Date(r.ts).toISOString(), ratio: r.ratio, orpMv: r.orp_mv, tempC: r.temp_c } : null;
  },
};
