import bcrypt from 'bcryptjs';
import { Router } from 'express';
import { firstRunSchema } from '../../../../shared/schemas/plant-setup.ts';
import { AppError } from '../../lib/app-error.ts';
import { body } from '../../middleware/validate.ts';
import { BCRYPT_COST } from '../auth/auth.service.ts';
import { firstRunRepository as repo } from './first-run.repository.ts';

/**
 * The first admin of an empty database, created with the one-time link `npm start` prints.
 * Needs no session by design: the token is the proof, and it works only while there are no users.
 */
export function firstRunRouter(): Router {
  const r = Router();
  r.get('/', async (_req, res) => {
    res.json({ needed: !(await repo.hasUsers()) });
  });
  r.post('/', async (req, res) => {
    const input = body(firstRunSchema, req);
    const passwordHash = await bcrypt.hash(input.password, BCRYPT_COST);
    const id = await repo.createFirstAdmin(input.token, { email: input.email, name: input.name, passwordHash });
    if (!id) throw new AppError(403, 'first-run-closed', 'This set-up link is not valid any more (used, expired, or someone has already been created). Restart Ferrisight on an empty database for a new one, or ask an admin.');
    res.status(201).json({ user: { id, email: input.email, name: input.name, role: 'admin' } });
  });
  return r;
}
