import { and, eq } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { memberships, teams, users } from '../../db/schema.ts';
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
