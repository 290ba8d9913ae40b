/**
 * Demo alarm settings for Kestrel Flats: definitions from the circuit templates, a call roster
 * and an escalation policy. Every person here is invented; e-mail addresses are @kestrel.example.
 */
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { templateById } from '../../shared/alarms/templates.ts';
import type { OnCallRole } from '../../shared/schemas/roster.ts';
import { definitionsRepository } from '../../api/src/modules/alarms/definitions.repository.ts';
import { rosterRepository } from '../../api/src/modules/roster/roster.repository.ts';

/** Which template each demo circuit uses. */
const CIRCUIT_TEMPLATE: Record<string, string> = { A: 'mesophilic-bioleach', B: 'hot-ferric-leach' };

/** Two people take turns in each on-call role, 12 h shifts changing at 06:00 and 18:00 site time (UTC+8). */
const ROTATIONS: Record<OnCallRole, Array<{ personName: string; email: string }>> = {
  primary: [
    { personName: 'Jules Marchetti', email: 'engineer@kestrel.example' },
    { personName: 'Rhea Castellanos', email: 'rhea.castellanos@kestrel.example' },
  ],
  backup: [
    { personName: 'Okoro Bright', email: 'okoro.bright@kestrel.example' },
    { personName: 'Linnea Vasquez', email: 'linnea.vasquez@kestrel.example' },
  ],
  supervisor: [
    { personName: 'Ana Lindqvist', email: 'supervisor@kestrel.example' },
    { personName: 'Mirela Haas', email: 'mirela.haas@kestrel.example' },
  ],
};

/** P1: on call after 5 min, then supervisor and backup after 15; P2: on call after 30; P3: no mail. */
export const DEMO_POLICY: Array<{ priority: number; steps: Array<{ afterMin: number; notify: OnCallRole[] }> }> = [
  { priority: 1, steps: [{ afterMin: 5, notify: ['primary'] }, { afterMin: 15, notify: ['supervisor', 'backup'] }] },
  { priority: 2, steps: [{ afterMin: 30, notify: ['primary'] }] },
  { priority: 3, steps: [] },
];

const HOUR = 3_600_000;

export async function seedDemoAlarms(sequelize: Sequelize, transaction: Transaction, now = new Date()): Promise<void> {
  const tanks = await sequelize.query<{ id: number; circuit: string }>(
    'SELECT t.id, c.tag AS circuit FROM tanks t JOIN circuits c ON c.id = t.circuit_id ORDER BY t.id', { type: QueryTypes.SELECT, transaction });
  for (const [i, t] of tanks.entries()) {
    const template = templateById(CIRCUIT_TEMPLATE[t.circuit] ?? '');
    for (const d of template?.definitions ?? []) await definitionsRepository.insert(sequelize, t.id, d, now, transaction);
    // Checks spread over the past week, so the overdue alarm shows up now and then, not all at once.
    await sequelize.query('INSERT INTO alarm_inputs (tank_id, last_probe_check_at, updated_at) VALUES (?, ?, ?)',
      { replacements: [t.id, new Date(now.getTime() - ((i % 6) + 0.5) * 24 * HOUR), now], transaction });
  }
  for (const p of DEMO_POLICY) await rosterRepository.replacePolicy(sequelize, p.priority, p.steps, transaction);
  // From the last shift change (22:00 or 10:00 UTC) a day ago, two weeks of shifts.
  const firstChange = Math.floor((now.getTime() - 24 * HOUR - 10 * HOUR) / (12 * HOUR)) * 12 * HOUR + 10 * HOUR;
  for (const [role, people] of Object.entries(ROTATIONS) as Array<[OnCallRole, typeof ROTATIONS.primary]>) {
    for (let n = 0; n < 30; n += 1) {
      const p = people[n % people.length];
      await rosterRepository.insert(sequelize, {
        personName: p.personName, email: p.email, roleOnCall: role,
        startsAt: new Date(firstChange + n * 12 * HOUR).toISOString(), endsAt: new Date(firstChange + (n + 1) * 12 * HOUR).toISOString(),
      }, null, transaction);
    }
  }
}
