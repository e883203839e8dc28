import { inject } from 'vitest';
import pg from 'pg';
import { openDatabase, type Database } from '../../server/db/client.ts';
import { ensureDatabase } from '../../server/lifecycle/postgres.ts';

export interface TestDatabase extends Database {
  url: string;
  name: string;
  /** Closes the pool and drops the database. */
  drop(): Promise<void>;
}

/**
 * A fresh, migrated database for one test file: a copy of the template the run migrated once,
 * so files never see each other's rows and can run in parallel.
 */
export async function createTestDatabase(): Promise<TestDatabase> {
  const adminUrl = inject('pgAdminUrl');
  const template = inject('pgTemplateDb');
  const name = `sw_t_${Date.now().toString(36)}_${Math.random().toString(36).slice(2, 8)}`;
  await ensureDatabase(adminUrl, name, template);
  const url = adminUrl.replace(/\/[^/]*$/, `/${name}`);
  const database = openDatabase(url, { max: 5 });
  return {
    ...database,
    url,
    name,
    async drop() {
      await database.close();
      const admin = new pg.Client({ connectionString: adminUrl });
      await admin.connect();
      try {
        await admin.query(`drop database if exists "${name}" with (force)`);
      } finally {
        await admin.end();
      }
    },
  };
}
