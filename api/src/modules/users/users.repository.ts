import type { CreateUserInput, Role, UserRow } from '../../../../shared/schemas/auth.ts';
import { User } from '../../db/models.ts';
import { sessionEvents } from '../../lib/session-events.ts';
import { writeAudit } from '../audit.repository.ts';

const toRow = (u: User): UserRow => ({
  id: u.id, email: u.email, name: u.name, role: u.role, disabled: u.disabled, createdAt: u.createdAt.toISOString(),
});

export const usersRepository = {
  async list(): Promise<UserRow[]> {
    return (await User.findAll({ order: [['role', 'ASC'], ['email', 'ASC']] })).map(toRow);
  },

  async findByEmailWithHash(email: string) {
    const u = await User.findOne({ where: { email } });
    return u && { ...toRow(u), passwordHash: u.passwordHash };
  },

  async findByIdWithHash(id: number) {
    const u = await User.findByPk(id);
    return u && { ...toRow(u), passwordHash: u.passwordHash };
  },

  async findSessionState(id: number) {
    const u = await User.findByPk(id, { attributes: ['id', 'email', 'name', 'role', 'disabled', 'tokensValidAfter'] });
    return u && { id: u.id, email: u.email, name: u.name, role: u.role as Role, disabled: u.disabled, tokensValidAfter: u.tokensValidAfter };
  },

  async create(input: Omit<CreateUserInput, 'password'> & { passwordHash: string }, byUserId: number | null): Promise<UserRow> {
    return User.sequelize!.transaction(async (transaction) => {
      const u = await User.create({ ...input, tokensValidAfter: new Date(0) }, { transaction });
      await writeAudit({ userId: byUserId, action: 'user.create', entity: 'user', entityId: u.id, after: toRow(u) }, transaction);
      return toRow(u);
    });
  },

  async update(id: number, { reason, ...changes }: { role?: Role; disabled?: boolean; name?: string; reason?: string }, byUserId: number): Promise<UserRow | null> {
    return User.sequelize!.transaction(async (transaction) => {
      const u = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
      if (!u) return null;
      const before = toRow(u);
      // A role change or disabling ends every session of that user at once.
      const revoke = (changes.role && changes.role !== u.role) || (changes.disabled === true && !u.disabled);
      await u.update({ ...changes, ...(revoke ? { tokensValidAfter: new Date() } : {}) }, { transaction });
      await writeAudit({ userId: byUserId, action: 'user.update', entity: 'user', entityId: id, before, after: toRow(u), reason }, transaction);
      return { row: toRow(u), revoke };
    }).then((r) => {
      if (r?.revoke) sessionEvents.emit('revoked', id);
      return r?.row ?? null;
    });
  },

  async revokeTokens(id: number): Promise<void> {
    await User.update({ tokensValidAfter: new Date() }, { where: { id } });
    sessionEvents.emit('revoked', id);
  },

  async setPassword(id: number, passwordHash: string, byUserId: number): Promise<void> {
    await User.sequelize!.transaction(async (transaction) => {
      await User.update({ passwordHash, tokensValidAfter: new Date() }, { where: { id }, transaction });
      await writeAudit({ userId: byUserId, action: 'user.password', entity: 'user', entityId: id }, transaction);
    });
    sessionEvents.emit('revoked', id);
  },
};
