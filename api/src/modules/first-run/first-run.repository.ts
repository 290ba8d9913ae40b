import { createHash, randomBytes } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import { User } from '../../db/models.ts';
import { writeAudit } from '../audit.repository.ts';

const sha256 = (s: string) => createHash('sha256').update(s).digest();
const TTL_MS = 24 * 3_600_000;

export const firstRunRepository = {
  hasUsers: async () => (await User.count()) > 0,

  /**
   * A new one-time set-up token for an empty database (earlier unused ones are dropped), or
   * null when someone has already been created. Only its SHA-256 is stored.
   */
  async issueToken(sequelize: Sequelize, nowMs = Date.now()): Promise<string | null> {
    const [{ n }] = await sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM users', { type: QueryTypes.SELECT });
    if (Number(n) > 0) return null;
    const token = randomBytes(24).toString('base64url');
    await sequelize.transaction(async (transaction) => {
      await sequelize.query('DELETE FROM setup_tokens WHERE used_at IS NULL', { transaction });
      await sequelize.query('INSERT INTO setup_tokens (token_sha256, expires_at, created_at) VALUES (?, ?, ?)', {
        replacements: [sha256(token), new Date(nowMs + TTL_MS), new Date(nowMs)], transaction,
      });
    });
    return token;
  },

  /** Creates the first admin when the token is valid and unused and there are still no users; false otherwise. */
  async createFirstAdmin(token: string, user: { email: string; name: string; passwordHash: string }): Promise<number | null> {
    const sequelize = User.sequelize!;
    return sequelize.transaction(async (transaction) => {
      const [row] = await sequelize.query<{ expires_at: Date; used_at: Date | null }>(
        'SELECT expires_at, used_at FROM setup_tokens WHERE token_sha256 = ? FOR UPDATE',
        { replacements: [sha256(token)], type: QueryTypes.SELECT, transaction });
      if (!row || row.used_at || new Date(row.expires_at).getTime() < Date.now()) return null;
      // Locks the users table's gap too: two set-up requests cannot both find it empty.
      const [{ n }] = await sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM users FOR UPDATE', { type: QueryTypes.SELECT, transaction });
      if (Number(n) > 0) return null;
      const u = await User.create({ ...user, role: 'admin', tokensValidAfter: new Date(0) }, { transaction });
      await sequelize.query('UPDATE setup_tokens SET used_at = ? WHERE token_sha256 = ?', { replacements: [new Date(), sha256(token)], transaction });
      await writeAudit({ userId: u.id, action: 'user.first-admin', entity: 'user', entityId: u.id, after: { email: u.email, name: u.name, role: 'admin' }, reason: 'First run' }, transaction);
      return u.id;
    });
  },
};
