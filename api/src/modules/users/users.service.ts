import bcrypt from 'bcryptjs';
import type { CreateUserInput, UpdateUserInput, UserRow } from '../../../../shared/schemas/auth.ts';
import { AppError } from '../../lib/app-error.ts';
import { BCRYPT_COST } from '../auth/auth.service.ts';
import { usersRepository } from './users.repository.ts';

export const usersService = {
  list: () => usersRepository.list(),

  async create(input: CreateUserInput, byUserId: number): Promise<UserRow> {
    if (await usersRepository.findByEmailWithHash(input.email)) throw AppError.conflict(`A user with e-mail ${input.email} already exists`);
    const { password, ...rest } = input;
    return usersRepository.create({ ...rest, passwordHash: await bcrypt.hash(password, BCRYPT_COST) }, byUserId);
  },

  async update(id: number, input: UpdateUserInput, byUserId: number): Promise<UserRow> {
    if (id === byUserId && (input.disabled === true || (input.role && input.role !== 'admin'))) {
      throw AppError.badRequest('You cannot disable yourself or remove your own admin role');
    }
    const row = await usersRepository.update(id, input, byUserId);
    if (!row) throw AppError.notFound('User');
    return row;
  },
};
