import { and, eq, isNull, sql } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { memberships, passwordResets, teams, users } from '../../db/schema.ts';
import { newId } from '../../../shared/model/ids.ts';
import type { Role } from '../../../shared/model/roles.ts';

export type UserRow = typeof users.$inferSelect;

export function findUserByEmail(db: Db, email: string) {
  return db.query.users.findFirst({ where: eq(users.email, email.trim().toLowerCase()) });
}

export function findUserById(db: Db, id: string) {
  return db.query.users.findFirst({ where: eq(users.id, id) });
}

export async function listMembershipsOf(db: Db, userId: string) {
  return db
    .select({ teamId: teams.id, teamName: teams.name, role: memberships.role })
    .from(memberships)
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(eq(memberships.userId, userId))
    .orderBy(teams.name);
}

export async function findRole(db: Db, userId: string, teamId: string): Promise<Role | null> {
  const row = await db.query.memberships.findFirst({
    where: and(eq(memberships.userId, userId), eq(memberships.teamId, teamId)),
  });
  return row?.role ?? null;
}

/** Creates a user and a new team owned by that user, in one transaction. */
export async function createUserWithTeam(
  db: Db,
  input: { email: string; name: string; passwordHash: string; teamName: string },
): Promise<{ userId: string; teamId: string }> {
  return db.transaction(async (tx) => {
    const userId = newId('user');
    const teamId = newId('team');
    await tx.insert(users).values({ id: userId, email: input.email.trim().toLowerCase(), name: input.name, passwordHash: input.passwordHash });
    await tx.insert(teams).values({ id: teamId, name: input.teamName });
    await tx.insert(memberships).values({ teamId, userId, role: 'owner' });
    return { userId, teamId };
  });
}

export async function createUser(db: Db, input: { email: string; name: string; passwordHash: string }): Promise<string> {
  const id = newId('user');
  await db.insert(users).values({ id, email: input.email.trim().toLowerCase(), name: input.name, passwordHash: input.passwordHash });
  return id;
}

export async function updatePassword(db: Db, userId: string, passwordHash: string) {
  await db.update(users).set({ passwordHash, updatedAt: sql`now()` }).where(eq(users.id, userId));
}

export async function insertPasswordReset(db: Db, row: { userId: string; tokenHash: string; expiresAt: Date }) {
  await db.insert(passwordResets).values({ id: newId('reset'), ...row });
}

export function findPasswordReset(db: Db, tokenHash: string) {
  return db.query.passwordResets.findFirst({ where: eq(passwordResets.tokenHash, tokenHash) });
}

/** Marks every open reset token of the user used (after a successful reset, old links die too). */
export async function consumePasswordResets(db: Db, userId: string): Promise<void> {
  await db.update(passwordResets).set({ usedAt: sql`now()` }).where(and(eq(passwordResets.userId, userId), isNull(passwordResets.usedAt)));
}

/** Ends every stored session of a user (password changed: other devices must sign in again). */
export async function deleteSessionsOf(db: Db, userId: string): Promise<void> {
  await db.execute(sql`delete from session where sess->'passport'->>'user' = ${userId}`);
}
