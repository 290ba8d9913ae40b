import { Router } from 'express';
import { z } from 'zod';
import { requireRole } from '../../middleware/auth.ts';
import { queryParams } from '../../middleware/validate.ts';
import { listCaughtMail } from './mail-store.ts';

/** GET /api/admin/mail — what the local SMTP catcher received (admin only), for demos and checks. */
export function mailRouter(mailDir: string | undefined): Router {
  const r = Router();
  r.use(requireRole('admin'));
  r.get('/', async (req, res) => {
    const { limit } = queryParams(z.object({ limit: z.coerce.number().int().min(1).max(500).default(100) }), req);
    res.json({ mail: mailDir ? await listCaughtMail(mailDir, limit) : [], folder: mailDir ?? null });
  });
  return r;
}
