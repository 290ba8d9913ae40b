import type { SessionUser } from '../../shared/schemas/auth.ts';

declare global {
  namespace Express {
    interface Request {
      user?: SessionUser & { expMs: number };
    }
  }
}

export {};
