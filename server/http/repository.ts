import { sql } from 'drizzle-orm';
import type { Db } from '../db/client.ts';
import { itemAt } from '../../shared/util/invariant.ts';

/**
 * The HTTP layer's one table: the rate limiters' hit counters (`rate_limits`), shared by every
 * server instance on the database so an attacker cannot multiply attempts across instances.
 */

/** Adds a hit to `key` (restarting its window when expired) in one statement; returns the count. */
export async function hitRateLimit(db: Db, key: string, windowMs: number): Promise<{ hits: number; resetAt: Date }> {
  const { rows } = await db.execute<{ hits: number; reset_at: Date }>(sql`
    insert into rate_limits (key, hits, reset_at)
    values (${key}, 1, now() + make_interval(secs => ${windowMs / 1000}))
    on conflict (key) do update set
      hits = case when rate_limits.reset_at <= now() then 1 else rate_limits.hits + 1 end,
      reset_at = case when rate_limits.reset_at <= now() then excluded.reset_at else rate_limits.reset_at end
    returning hits, reset_at`);
  return { hits: Number(itemAt(rows, 0).hits), resetAt: new Date(itemAt(rows, 0).reset_at) };
}

/** Takes one hit back (a request that, in the end, does not count). */
export async function unhitRateLimit(db: Db, key: string): Promise<void> {
  await db.execute(sql`update rate_limits set hits = greatest(hits - 1, 0) where key = ${key}`);
}

export async function clearRateLimit(db: Db, key: string): Promise<void> {
  await db.execute(sql`delete from rate_limits where key = ${key}`);
}
