import { Router } from 'express';
import { createUserSchema, updateUserSchema } from '../../../../shared/schemas/auth.ts';
import { idParamSchema } from '../../../../shared/schemas/plant.ts';
import { requireRole } from '../../middleware/auth.ts';
import { body, params } from '../../middleware/validate.ts';
import { usersService } from './users.service.ts';

export function usersRouter(): Router {
  const r = Router();
  r.use(requireRole('admin'));
  r.get('/', async (_req, res) => {
    res.json({ users: await usersService.list() });
  });
  r.post('/', async (req, res) => {
    res.status(201).json({ user: await usersService.create(body(createUserSchema, req), req.user!.id) });
  });
  r.patch('/:id', async (req, res) => {
    const { id } = params(idParamSchema, req);
    res.json({ user: await usersService.update(id, body(updateUserSchema, req), req.user!.id) });
  });
  return r;
}
