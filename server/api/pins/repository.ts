import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Db } from '../../db/client.ts';
import { memberships, pinReplies, pins, users } from '../../db/schema.ts';
import { newId } from '../../../shared/model/ids.ts';
import type { PinTarget } from '../../../shared/model/review.ts';

const author = alias(users, 'author');
const resolver = alias(users, 'resolver');

/** A pin with its author's and resolver's names (list and detail share it). */
const pinColumns = {
      id: pins.id,
      sketchId: pins.sketchId,
      target: pins.target,
      status: pins.status,
      authorName: author.name,
      resolvedByName: resolver.name,
      createdAt: pins.createdAt,
      updatedAt: pins.updatedAt,
};

export async function listPins(db: Db, sketchId: string, status: 'open' | 'resolved' | 'all', limit: number, offset: number) {
  const where = status === 'all' ? eq(pins.sketchId, sketchId) : and(eq(pins.sketchId, sketchId), eq(pins.status, status));
  const rows = await db
    .select({
      ...pinColumns,
      firstBody: sql<string>`(select body from pin_replies r where r.pin_id = ${pins.id} order by r.created_at asc, r.id asc limit 1)`,
      replyCount: sql<number>`(select count(*)::int - 1 from pin_replies r where r.pin_id = ${pins.id})`,
    })
    .from(pins)
    .leftJoin(author, eq(author.id, pins.authorId))
    .leftJoin(resolver, eq(resolver.id, pins.resolvedBy))
    .where(where)
    .orderBy(desc(pins.createdAt), desc(pins.id))
    .limit(limit)
    .offset(offset);
  const total = await db.$count(pins, where);
  return { rows, total };
}

export async function findPin(db: Db, pinId: string) {
  const rows = await db
    .select(pinColumns)
    .from(pins)
    .leftJoin(author, eq(author.id, pins.authorId))
    .leftJoin(resolver, eq(resolver.id, pins.resolvedBy))
    .where(eq(pins.id, pinId));
  return rows[0] ?? null;
}

export function listReplies(db: Db, pinId: string) {
  return db
    .select({ id: pinReplies.id, authorId: pinReplies.authorId, authorName: users.name, body: pinReplies.body, mentions: pinReplies.mentions, createdAt: pinReplies.createdAt })
    .from(pinReplies)
    .leftJoin(users, eq(users.id, pinReplies.authorId))
    .where(eq(pinReplies.pinId, pinId))
    .orderBy(asc(pinReplies.createdAt), asc(pinReplies.id));
}

export async function insertPin(db: Db, input: { sketchId: string; authorId: string; target: PinTarget; body: string; mentions: string[] }): Promise<string> {
  return db.transaction(async (tx) => {
    const id = newId('pin');
    await tx.insert(pins).values({ id, sketchId: input.sketchId, authorId: input.authorId, target: input.target });
    await tx.insert(pinReplies).values({ id: newId('reply'), pinId: id, authorId: input.authorId, body: input.body, mentions: input.mentions });
    return id;
  });
}

export async function insertReply(db: Db, input: { pinId: string; authorId: string; body: string; mentions: string[] }) {
  await db.insert(pinReplies).values({ id: newId('reply'), ...input });
  await db.update(pins).set({ updatedAt: sql`now()` }).where(eq(pins.id, input.pinId));
}

export async function setPinStatus(db: Db, pinId: string, status: 'open' | 'resolved', userId: string) {
  await db
    .update(pins)
    .set(status === 'resolved' ? { status, resolvedBy: userId, resolvedAt: sql`now()`, updatedAt: sql`now()` } : { status, resolvedBy: null, resolvedAt: null, updatedAt: sql`now()` })
    .where(eq(pins.id, pinId));
}

/** The members of `teamId` among `userIds` (mentions must name team members). */
export async function membersAmong(db: Db, teamId: string, userIds: string[]) {
  if (userIds.length === 0) return [];
  return db
    .select({ id: users.id, name: users.name, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.teamId, teamId), inArray(memberships.userId, userIds)));
}
