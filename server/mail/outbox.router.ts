import { Router } from 'express';
import type { MountRoute } from '../lib/route.ts';
import type { Mailer } from './mailer.ts';

export function outboxRouter(mount: MountRoute, mailer: Mailer) {
  const router = Router();
  mount(router, 'outbox.list', async (_req, res) => {
    res.json({ items: await mailer.outbox() });
  });
  return router;
}
