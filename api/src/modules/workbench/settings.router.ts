import { Router } from 'express';
import { updateSettingSchema } from '../../../../shared/schemas/workbench.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body } from '../../middleware/validate.ts';
import { settingsRepository } from './settings.repository.ts';

/**
 * Workbench site settings. Only admins change them: the approval factor is the brake on band
 * changes, so the people whose changes it brakes must not be able to loosen it themselves.
 */
export function settingsRouter(): Router {
  const r = Router();
  r.get('/settings', requireSignIn, async (_req, res) => {
    res.json(await settingsRepository.all());
  });
  r.put('/settings', requireRole('admin'), async (req, res) => {
    res.json({ settings: await settingsRepository.update(body(updateSettingSchema, req), req.user!.id) });
  });
  return r;
}
