import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { AlarmKind } from '../../../../shared/alarms/kinds.ts';

/** The acknowledge links sent in escalation mail, and what their pages show of the alarm. */
export type AckLink = { jti: string; instanceId: number; personName: string; email: string; expiresAt: Date; usedAt: Date | null };
export type AckAlarm = {
  id: number; tankTag: string | null; kind: AlarmKind; priority: number; state: string; open: boolean; ackedBy: string | null; ackedAt: Date | null;
};

type LinkRow = { jti: string; instance_id: number; person_name: string; email: string; expires_at: Date; used_at: Date | null };
type AlarmRow = { id: number; tank_tag: string | null; kind: AlarmKind; priority: number; state: string; open_definition_id: number | null; acked_by: string | null; acked_at: Date | null };

const toLink = (r: LinkRow): AckLink => ({
  jti: r.jti, instanceId: r.instance_id, personName: r.person_name, email: r.email, expiresAt: new Date(r.expires_at), usedAt: r.used_at && new Date(r.used_at),
});

export const ackLinksRepository = {
  async alarm(sequelize: Sequelize, id: number): Promise<AckAlarm | null> {
    const [a] = await sequelize.query<AlarmRow>(
      'SELECT i.id, t.tag AS tank_tag, d.kind, i.priority, i.state, i.open_definition_id, i.acked_by, i.acked_at FROM alarm_instances i JOIN alarm_definitions d ON d.id = i.definition_id LEFT JOIN tanks t ON t.id = i.tank_id WHERE i.id = ?',
      { replacements: [id], type: QueryTypes.SELECT });
    return a ? { id: a.id, tankTag: a.tank_tag, kind: a.kind, priority: a.priority, state: a.state, open: a.open_definition_id !== null, ackedBy: a.acked_by, ackedAt: a.acked_at } : null;
  },

  /** A link by its token id; with a transaction, locked until it ends. */
  async link(sequelize: Sequelize, jti: string, t?: Transaction): Promise<AckLink | null> {
    const [row] = await sequelize.query<LinkRow>(`SELECT * FROM alarm_ack_links WHERE jti = ?${t ? ' FOR UPDATE' : ''}`,
      { replacements: [jti], type: QueryTypes.SELECT, transaction: t });
    return row ? toLink(row) : null;
  },

  /** The enabled user account with this e-mail address, if any. */
  async userByEmail(sequelize: Sequelize, t: Transaction, email: string): Promise<{ id: number; name: string } | null> {
    const [user] = await sequelize.query<{ id: number; name: string }>('SELECT id, name FROM users WHERE email = ? AND disabled = 0',
      { replacements: [email], type: QueryTypes.SELECT, transaction: t });
    return user ?? null;
  },

  async markUsed(sequelize: Sequelize, t: Transaction, jti: string, at: Date): Promise<void> {
    await sequelize.query('UPDATE alarm_ack_links SET used_at = ? WHERE jti = ?', { replacements: [at, jti], transaction: t });
  },
};
