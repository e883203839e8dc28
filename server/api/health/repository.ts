import { sql } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';

/** `created_at` (the journal's `when`) of the newest migration applied, or null for none. */
export async function latestAppliedMigration(db: Db): Promise<number | null> {
  const { rows } = await db.execute<{ created_at: string }>(sql`select created_at from drizzle.__drizzle_migrations order by created_at desc limit 1`);
  return rows[0] ? Number(rows[0].created_at) : null;
}
