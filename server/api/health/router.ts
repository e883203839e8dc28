import { Router } from 'express';
import type pg from 'pg';
import { readJournal } from '../../db/migrate.ts';

/**
 * GET /api/health: whether the database answers and which migration it is at. Public (no
 * sign-in) so that a load balancer or `npm start` can probe it; it reveals no data.
 */
export function healthRouter(pool: pg.Pool): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const journal = readJournal();
    const expected = journal.at(-1)?.tag ?? null;
    try {
      const { rows } = await pool.query<{ created_at: string }>(
        'select created_at from drizzle.__drizzle_migrations order by created_at desc limit 1',
      );
      const appliedWhen = rows[0] ? Number(rows[0].created_at) : null;
      const applied = journal.find((e) => e.when === appliedWhen)?.tag ?? null;
      const upToDate = applied !== null && applied === expected;
      res.status(upToDate ? 200 : 503).json({
        status: upToDate ? 'ok' : 'degraded',
        database: { reachable: true, migration: applied, expectedMigration: expected, upToDate },
      });
    } catch (err) {
      res.status(503).json({
        status: 'degraded',
        database: { reachable: false, migration: null, expectedMigration: expected, upToDate: false, reason: (err as Error).message },
      });
    }
  });
  return router;
}
