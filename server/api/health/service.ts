import type { Db } from '../../db/client.ts';
import { readJournal } from '../../db/migrate.ts';
import { isDatabaseUnavailable } from '../../db/errors.ts';
import { latestAppliedMigration } from './repository.ts';

export interface Health {
  status: 'ok' | 'degraded';
  database: { reachable: boolean; migration: string | null; expectedMigration: string | null; upToDate: boolean; reason?: string };
}

/**
 * Whether the database answers and whether it is at the newest migration this build ships. It
 * reveals no data — not even the database's error text (which can name hosts, users and files),
 * only what kind of failure it is.
 */
export async function checkHealth(db: Db, log: (line: string) => void): Promise<Health> {
  const journal = readJournal();
  const expected = journal.at(-1)?.tag ?? null;
  try {
    const appliedWhen = await latestAppliedMigration(db);
    const applied = journal.find((e) => e.when === appliedWhen)?.tag ?? null;
    const upToDate = applied !== null && applied === expected;
    return {
      status: upToDate ? 'ok' : 'degraded',
      database: { reachable: true, migration: applied, expectedMigration: expected, upToDate },
    };
  } catch (err) {
    const unreachable = isDatabaseUnavailable(err);
    if (!unreachable) log(`[health] database check failed: ${(err as Error).name}`);
    return {
      status: 'degraded',
      database: {
        reachable: false,
        migration: null,
        expectedMigration: expected,
        upToDate: false,
        reason: unreachable ? 'The database is not reachable.' : 'The database answered the health check with an error.',
      },
    };
  }
}
