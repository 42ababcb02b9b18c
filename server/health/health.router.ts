import { Router } from 'express';
import type { Database } from '../db.ts';
import { AppError } from '../lib/app-error.ts';
import type { MountRoute } from '../lib/route.ts';

export function healthRouter(mount: MountRoute, db: Database) {
  const router = Router();
  mount(router, 'health', async (_req, res) => {
    try {
      await db.sequelize.query('SELECT 1');
    } catch {
      throw new AppError(503, 'unavailable', 'the database cannot be reached');
    }
    res.set('Cache-Control', 'no-store').json({ ok: true });
  });
  return router;
}
