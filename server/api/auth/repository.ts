import { and, eq, isNull, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client.ts';
import { memberships, passwordResets, signUps, teams, users } from '../../db/schema.ts';
import { sqlState } from '../../db/errors.ts';
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

export async function createUser(db: DbOrTx, input: { email: string; name: string; passwordHash: string }): Promise<string> {
  const id = newId('user');
  await db.insert(users).values({ id, email: input.email.trim().toLowerCase(), name: input.name, passwordHash: input.passwordHash });
  return id;
}

export async function insertPasswordReset(db: Db, row: { userId: string; tokenHash: string; expiresAt: Date }) {
  await db.insert(passwordResets).values({ id: newId('reset'), ...row });
}

// ── Sign-up in two steps: a pending sign-up, then the account once the address is confirmed ──

export async function insertSignUp(db: Db, row: { email: string; name: string; teamName: string; passwordHash: string; tokenHash: string; expiresAt: Date }): Promise<void> {
  await db.insert(signUps).values({ id: newId('signup'), ...row, email: row.email.trim().toLowerCase() });
}

export function findSignUp(db: Db, tokenHash: string) {
  return db.query.signUps.findFirst({ where: eq(signUps.tokenHash, tokenHash) });
}

export type SignUpCompletion = { ok: true; userId: string; teamId: string } | { ok: false; reason: 'used' | 'email_taken' };

/**
 * Turns a confirmed sign-up into a user owning a new team, atomically: the sign-up is consumed
 * (single use, even when the link is opened twice at once), then the user, the team and the
 * membership are created. An address that got an account meanwhile (another sign-up confirmed
 * first, an invitation accepted) is refused as `email_taken` and nothing is written.
 */
export async function completeSignUp(db: Db, signUpId: string): Promise<SignUpCompletion> {
  try {
    return await db.transaction(async (tx) => {
      const [pending] = await tx
        .update(signUps)
        .set({ usedAt: sql`now()` })
        .where(and(eq(signUps.id, signUpId), isNull(signUps.usedAt)))
        .returning();
      if (!pending) return { ok: false, reason: 'used' } as const;
      const userId = newId('user');
      const teamId = newId('team');
      await tx.insert(users).values({ id: userId, email: pending.email, name: pending.name, passwordHash: pending.passwordHash });
      await tx.insert(teams).values({ id: teamId, name: pending.teamName });
      await tx.insert(memberships).values({ teamId, userId, role: 'owner' });
      return { ok: true, userId, teamId } as const;
    });
  } catch (err) {
    if (sqlState(err) === '23505') return { ok: false, reason: 'email_taken' };
    throw err;
  }
}

export type ResetOutcome =
  | { ok: true; user: { id: string; email: string; name: string } }
  | { ok: false; reason: 'invalid' | 'used' | 'expired' };

/**
 * A password reset, atomically: the token's row is locked, the password replaced, every open
 * reset link of the user consumed and every stored session of the user ended (other devices
 * must sign in again).
 */
export async function resetPasswordAtomically(db: Db, input: { tokenHash: string; passwordHash: string }): Promise<ResetOutcome> {
  return db.transaction(async (tx) => {
    const [reset] = await tx.select().from(passwordResets).where(eq(passwordResets.tokenHash, input.tokenHash)).for('update');
    if (!reset) return { ok: false, reason: 'invalid' } as const;
    if (reset.usedAt) return { ok: false, reason: 'used' } as const;
    if (reset.expiresAt.getTime() <= Date.now()) return { ok: false, reason: 'expired' } as const;
    const user = await tx.query.users.findFirst({ where: eq(users.id, reset.userId), columns: { id: true, email: true, name: true } });
    if (!user) return { ok: false, reason: 'invalid' } as const;
    await tx.update(users).set({ passwordHash: input.passwordHash, updatedAt: sql`now()` }).where(eq(users.id, user.id));
    await tx.update(passwordResets).set({ usedAt: sql`now()` }).where(and(eq(passwordResets.userId, user.id), isNull(passwordResets.usedAt)));
    await tx.execute(sql`delete from session where sess->'passport'->>'user' = ${user.id}`);
    return { ok: true, user } as const;
  });
}
