import { QueryTypes, type Sequelize } from 'sequelize';
import { KIND_INFO, type AlarmKind } from '../../../../shared/alarms/kinds.ts';
import { applyInTransaction, withAlarmLock } from '../alarms/lifecycle.ts';
import { verifyAckToken } from './ack-links.ts';

/**
 * The e-mail acknowledge link: GET only looks (mail scanners prefetch links), POST acts. A
 * tampered, expired or used link, or an alarm already handled, gets a page that says so and
 * changes nothing; the link is marked used in the same transaction as the acknowledgement.
 */
export type AckOutcome = 'confirm' | 'done' | 'used' | 'expired' | 'invalid' | 'nothing';
export type AckPage = {
  outcome: AckOutcome;
  personName?: string;
  alarm?: { id: number; tankTag: string; label: string; priority: number; state: string; ackedBy: string | null; ackedAt: Date | null };
};

type LinkRow = { jti: string; instance_id: number; person_name: string; email: string; expires_at: Date; used_at: Date | null };
type AlarmRow = { id: number; tank_tag: string; kind: AlarmKind; priority: number; state: string; open_definition_id: number | null; acked_by: string | null; acked_at: Date | null };

async function alarmOf(sequelize: Sequelize, id: number): Promise<AckPage['alarm']> {
  const [a] = await sequelize.query<AlarmRow>(
    'SELECT i.id, t.tag AS tank_tag, d.kind, i.priority, i.state, i.open_definition_id, i.acked_by, i.acked_at FROM alarm_instances i JOIN alarm_definitions d ON d.id = i.definition_id JOIN tanks t ON t.id = i.tank_id WHERE i.id = ?',
    { replacements: [id], type: QueryTypes.SELECT });
  if (!a) return undefined;
  return { id: a.id, tankTag: a.tank_tag, label: KIND_INFO[a.kind].label, priority: a.priority, state: a.open_definition_id === null ? 'normal' : a.state, ackedBy: a.acked_by, ackedAt: a.acked_at };
}

const ackable = (state: string | undefined) => state === 'unacknowledged' || state === 'rtn-unacknowledged';

async function checkLink(sequelize: Sequelize, secret: string, token: string, now: Date): Promise<{ page: AckPage } | { link: LinkRow }> {
  const verdict = verifyAckToken(secret, token, now.getTime());
  if (!verdict.ok) return { page: { outcome: verdict.reason } };
  const [link] = await sequelize.query<LinkRow>('SELECT * FROM alarm_ack_links WHERE jti = ?',
    { replacements: [verdict.claims.jti], type: QueryTypes.SELECT });
  if (!link || link.instance_id !== verdict.claims.instanceId || link.email !== verdict.claims.email) return { page: { outcome: 'invalid' } };
  if (link.used_at) return { page: { outcome: 'used', personName: link.person_name, alarm: await alarmOf(sequelize, link.instance_id) } };
  if (new Date(link.expires_at).getTime() <= now.getTime()) return { page: { outcome: 'expired' } };
  return { link };
}

export async function inspectAckLink(sequelize: Sequelize, secret: string, token: string, now = new Date()): Promise<AckPage> {
  const checked = await checkLink(sequelize, secret, token, now);
  if ('page' in checked) return checked.page;
  const alarm = await alarmOf(sequelize, checked.link.instance_id);
  return { outcome: ackable(alarm?.state) ? 'confirm' : 'nothing', personName: checked.link.person_name, alarm };
}

export async function useAckLink(sequelize: Sequelize, secret: string, token: string, now = new Date(), comment?: string): Promise<AckPage> {
  const verdict = verifyAckToken(secret, token, now.getTime());
  if (!verdict.ok) return { outcome: verdict.reason };
  const outcome = await withAlarmLock(sequelize, async (t) => {
    const [link] = await sequelize.query<LinkRow>('SELECT * FROM alarm_ack_links WHERE jti = ? FOR UPDATE', { replacements: [verdict.claims.jti], type: QueryTypes.SELECT, transaction: t });
    if (!link || link.instance_id !== verdict.claims.instanceId || link.email !== verdict.claims.email) return { outcome: 'invalid' as const };
    if (link.used_at) return { outcome: 'used' as const, link };
    if (new Date(link.expires_at).getTime() <= now.getTime()) return { outcome: 'expired' as const };
    // Acknowledge as the person the link was sent to; as their user account when they have one.
    const [user] = await sequelize.query<{ id: number; name: string }>('SELECT id, name FROM users WHERE email = ? AND disabled = 0',
      { replacements: [link.email], type: QueryTypes.SELECT, transaction: t });
    const result = await applyInTransaction(sequelize, t, {
      instanceId: link.instance_id, action: 'acknowledge', at: now,
      actor: { userId: user?.id ?? null, name: user?.name ?? link.person_name, how: 'email' },
      comment: comment?.trim().slice(0, 1000) || 'Acknowledged from the e-mail link',
    });
    if (!result.ok) return { outcome: 'nothing' as const, link };
    await sequelize.query('UPDATE alarm_ack_links SET used_at = ? WHERE jti = ?', { replacements: [now, link.jti], transaction: t });
    return { outcome: 'done' as const, link };
  });
  const link = 'link' in outcome ? outcome.link : undefined;
  return { outcome: outcome.outcome, personName: link?.person_name, alarm: link ? await alarmOf(sequelize, link.instance_id) : undefined };
}
