import { Router } from 'express';
import type { Db } from '../../db/client.ts';
import { readJournal } from '../../db/migrate.ts';
import { isDatabaseUnavailable } from '../../db/errors.ts';
import { latestAppliedMigration } from './repository.ts';

/**
 * GET /api/health: whether the database answers and which migration it is at. Public (no
 * sign-in) so that a load balancer or `npm start` can probe it; it reveals no data — not even the
 * database's error text (which can name hosts, users and files), only what kind of failure it is.
 */
export function healthRouter(db: Db, log: (line: string) => void): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const journal = readJournal();
    const expected = journal.at(-1)?.tag ?? null;
    try {
      const appliedWhen = await latestAppliedMigration(db);
      const applied = journal.find((e) => e.when === appliedWhen)?.tag ?? null;
      const upToDate = applied !== null && applied === expected;
      res.status(upToDate ? 200 : 503).json({
        status: upToDate ? 'ok' : 'degraded',
        database: { reachable: true, migration: applied, expectedMigration: expected, upToDate },
      });
    } catch (err) {
      const unreachable = isDatabaseUnavailable(err);
      if (!unreachable) log(`[health] database check failed: ${(err as Error).name}`);
      res.status(503).json({
        status: 'degraded',
        database: {
          reachable: false,
          migration: null,
          expectedMigration: expected,
          upToDate: false,
          reason: unreachable ? 'The database is not reachable.' : 'The database answered the health check with an error.',
        },
      });
    }
  });
  return router;
}
