import type { Sequelize } from 'sequelize';
import { KIND_INFO } from '../../../../shared/alarms/kinds.ts';
import { applyInTransaction } from '../alarms/lifecycle.ts';
import { withAlarmLock } from '../alarms/lifecycle.repository.ts';
import { ackLinksRepository as repo, type AckLink } from './ack-links.repository.ts';
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
  alarm?: { id: number; tankTag: string | null; label: string; priority: number; state: string; ackedBy: string | null; ackedAt: Date | null };
};

async function alarmOf(sequelize: Sequelize, id: number): Promise<AckPage['alarm']> {
  const a = await repo.alarm(sequelize, id);
  if (!a) return undefined;
  return { id: a.id, tankTag: a.tankTag, label: KIND_INFO[a.kind].label, priority: a.priority, state: a.open ? a.state : 'normal', ackedBy: a.ackedBy, ackedAt: a.ackedAt };
}

const ackable = (state: string | undefined) => state === 'unacknowledged' || state === 'rtn-unacknowledged';

async function checkLink(sequelize: Sequelize, secret: string, token: string, now: Date): Promise<{ page: AckPage } | { link: AckLink }> {
  const verdict = verifyAckToken(secret, token, now.getTime());
  if (!verdict.ok) return { page: { outcome: verdict.reason } };
  const link = await repo.link(sequelize, verdict.claims.jti);
  if (!link || link.instanceId !== verdict.claims.instanceId || link.email !== verdict.claims.email) return { page: { outcome: 'invalid' } };
  if (link.usedAt) return { page: { outcome: 'used', personName: link.personName, alarm: await alarmOf(sequelize, link.instanceId) } };
  if (link.expiresAt.getTime() <= now.getTime()) return { page: { outcome: 'expired' } };
  return { link };
}

export async function inspectAckLink(sequelize: Sequelize, secret: string, token: string, now = new Date()): Promise<AckPage> {
  const checked = await checkLink(sequelize, secret, token, now);
  if ('page' in checked) return checked.page;
  const alarm = await alarmOf(sequelize, checked.link.instanceId);
  return { outcome: ackable(alarm?.state) ? 'confirm' : 'nothing', personName: checked.link.personName, alarm };
}

export async function useAckLink(sequelize: Sequelize, secret: string, token: string, now = new Date(), comment?: string): Promise<AckPage> {
  const verdict = verifyAckToken(secret, token, now.getTime());
  if (!verdict.ok) return { outcome: verdict.reason };
  const outcome = await withAlarmLock(sequelize, async (t) => {
    const link = await repo.link(sequelize, verdict.claims.jti, t);
    if (!link || link.instanceId !== verdict.claims.instanceId || link.email !== verdict.claims.email) return { outcome: 'invalid' as const };
    if (link.usedAt) return { outcome: 'used' as const, link };
    if (link.expiresAt.getTime() <= now.getTime()) return { outcome: 'expired' as const };
    // Acknowledge as the person the link was sent to; as their user account when they have one.
    const user = await repo.userByEmail(sequelize, t, link.email);
    const result = await applyInTransaction(sequelize, t, {
      instanceId: link.instanceId, action: 'acknowledge', at: now,
      actor: { userId: user?.id ?? null, name: user?.name ?? link.personName, how: 'email' },
      comment: comment?.trim().slice(0, 1000) || 'Acknowledged from the e-mail link',
    });
    if (!result.ok) return { outcome: 'nothing' as const, link };
    await repo.markUsed(sequelize, t, link.jti, now);
    return { outcome: 'done' as const, link };
  });
  const link = 'link' in outcome ? outcome.link : undefined;
  return { outcome: outcome.outcome, personName: link?.personName, alarm: link ? await alarmOf(sequelize, link.instanceId) : undefined };
}
