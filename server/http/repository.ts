import { and, eq, gt, inArray, sql } from 'drizzle-orm';
import type { Db } from '../db/client.ts';
import { heavyWorkSlots } from '../db/schema.ts';
import { itemAt } from '../../shared/util/invariant.ts';

/**
 * The HTTP layer's tables, shared by every server instance on the database so nobody multiplies
 * a bound by the number of instances: the rate limiters' hit counters (`rate_limits`) and the
 * heavy-work slots held now (`heavy_work_slots`, [H1]).
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

/**
 * Advisory-lock class of heavy-work claims: `pg_advisory_xact_lock(class, hashtext(user id))`.
 * The two-key lock space never overlaps the one-key space the migrator uses.
 */
const HEAVY_CLAIM_LOCK_CLASS = 7271;

const leaseEnd = (leaseMs: number) => sql`now() + make_interval(secs => ${leaseMs / 1000})`;

/**
 * Claims one of `userId`'s heavy-work slots atomically [H1]: claims of one person are serialized
 * over every instance (a transaction-scoped advisory lock), the person's live slots — leases not
 * yet run out — are counted, and the slot is written only when fewer than `perUser` are held.
 * Run-out slots of the person are deleted on the way.
 */
export async function claimHeavySlot(
  db: Db,
  slot: { id: string; userId: string; instanceId: string; leaseMs: number },
  perUser: number,
): Promise<{ claimed: true } | { claimed: false; held: number }> {
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${HEAVY_CLAIM_LOCK_CLASS}, hashtext(${slot.userId}))`);
    await tx.delete(heavyWorkSlots).where(and(eq(heavyWorkSlots.userId, slot.userId), sql`${heavyWorkSlots.leaseUntil} <= now()`));
    const [row] = await tx.select({ held: sql<number>`count(*)::int` }).from(heavyWorkSlots).where(eq(heavyWorkSlots.userId, slot.userId));
    const held = Number(row?.held ?? 0);
    if (held >= perUser) return { claimed: false, held };
    await tx.insert(heavyWorkSlots).values({ id: slot.id, userId: slot.userId, instanceId: slot.instanceId, leaseUntil: leaseEnd(slot.leaseMs) });
    return { claimed: true };
  });
}

/** How many heavy-work slots `userId` holds now (leases not run out), over every instance. */
export async function countHeavySlots(db: Db, userId: string): Promise<number> {
  const [row] = await db
    .select({ held: sql<number>`count(*)::int` })
    .from(heavyWorkSlots)
    .where(and(eq(heavyWorkSlots.userId, userId), gt(heavyWorkSlots.leaseUntil, sql`now()`)));
  return Number(row?.held ?? 0);
}

/**
 * Renews the leases of `ids` for another `leaseMs`; returns the ids still held. A slot whose
 * lease already ran out is not revived (someone may have counted it free and claimed in its
 * place): it is missing from the answer, and its holder must stop.
 */
export async function renewHeavySlots(db: Db, ids: string[], leaseMs: number): Promise<Set<string>> {
  if (ids.length === 0) return new Set();
  const rows = await db
    .update(heavyWorkSlots)
    .set({ leaseUntil: leaseEnd(leaseMs) })
    .where(and(inArray(heavyWorkSlots.id, ids), gt(heavyWorkSlots.leaseUntil, sql`now()`)))
    .returning({ id: heavyWorkSlots.id });
  return new Set(rows.map((r) => r.id));
}

/** Gives a slot back. */
export async function releaseHeavySlot(db: Db, id: string): Promise<void> {
  await db.delete(heavyWorkSlots).where(eq(heavyWorkSlots.id, id));
}

/** Gives back every slot of an instance (when it shuts down). */
export async function releaseInstanceHeavySlots(db: Db, instanceId: string): Promise<void> {
  await db.delete(heavyWorkSlots).where(eq(heavyWorkSlots.instanceId, instanceId));
}
