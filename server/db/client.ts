import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema.ts';

export type Db = NodePgDatabase<typeof schema>;

export interface Database {
  pool: pg.Pool;
  db: Db;
  close(): Promise<void>;
}

/** Opens a connection pool and the Drizzle handle over it. Repositories receive `db`. */
export function openDatabase(url: string, options: { max?: number } = {}): Database {
  const pool = new pg.Pool({ connectionString: url, max: options.max ?? 10 });
  // An idle client losing its connection must not crash the process; the pool replaces it.
  pool.on('error', (err) => console.error(`[db] idle client error: ${err.message}`));
  const db = drizzle(pool, { schema, casing: 'snake_case' });
  return {
    pool,
    db,
    close: () => pool.end(),
  };
}
