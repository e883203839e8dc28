import { Router } from 'express';
import type { Db } from '../../db/client.ts';
import { checkHealth } from './service.ts';

/**
 * GET /api/health: whether the database answers and which migration it is at. Public (no
 * sign-in) so that a load balancer or `npm start` can probe it; it reveals no data.
 */
export function healthRouter(db: Db, log: (line: string) => void): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const health = await checkHealth(db, log);
    res.status(health.status === 'ok' ? 200 : 503).json(health);
  });
  return router;
}
