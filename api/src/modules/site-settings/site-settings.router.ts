import { Router } from 'express';
import { updateSettingSchema } from '../../../../shared/schemas/workbench.ts';
import { requireRole, requireSignIn } from '../../middleware/auth.ts';
import { body } from '../../middleware/validate.ts';
import { siteSettingsRepository } from './site-settings.repository.ts';

/**
 * Site settings (approval factor, assay match window, probe check interval…). Only admins change them: the approval factor is the brake on band
 * changes, so the people whose changes it brakes must not be able to loosen it themselves.
 */
export function siteSettingsRouter(): Router {
  const r = Router();
  r.get('/', requireSignIn, async (_req, res) => {
    res.json(await siteSettingsRepository.all());
  });
  r.put('/', requireRole('admin'), async (req, res) => {
    res.json({ settings: await siteSettingsRepository.update(body(updateSettingSchema, req), req.user!.id) });
  });
  return r;
}
