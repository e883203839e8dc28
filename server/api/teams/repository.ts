import { and, desc, eq, gt, isNull, sql, count } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { auditEvents, invitations, memberships, teams, users } from '../../db/schema.ts';
import { newId } from '../../../shared/model/ids.ts';
import type { Role } from '../../../shared/model/roles.ts';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
type DbOrTx = Db | Tx;

export function findTeam(db: DbOrTx, teamId: string) {
  return db.query.teams.findFirst({ where: eq(teams.id, teamId) });
}

export async function createTeam(db: Db, name: string, ownerId: string): Promise<string> {
  return db.transaction(async (tx) => {
    const id = newId('team');
    await tx.insert(teams).values({ id, name });
    await tx.insert(memberships).values({ teamId: id, userId: ownerId, role: 'owner' });
    await recordAudit(tx, { teamId: id, actorId: ownerId, action: 'team.created', detail: { name } });
    return id;
  });
}

export async function deleteTeam(db: Db, teamId: string): Promise<void> {
  await db.delete(teams).where(eq(teams.id, teamId));
}

export function listMembers(db: DbOrTx, teamId: string) {
  return db
    .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, since: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.teamId, teamId))
    .orderBy(users.name);
}

export async function findMembership(db: DbOrTx, teamId: string, userId: string) {
  return db.query.memberships.findFirst({ where: and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)) });
}

/** Locks the team's owner rows so two concurrent demotions cannot both pass the last-owner check. */
export async function countOwnersForUpdate(tx: Tx, teamId: string): Promise<number> {
  const rows = await tx.execute<{ user_id: string }>(
    sql`select user_id from memberships where team_id = ${teamId} and role = 'owner' for update`,
  );
  return rows.rows.length;
}

export async function setRole(tx: DbOrTx, teamId: string, userId: string, role: Role) {
  await tx.update(memberships).set({ role, updatedAt: sql`now()` }).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
}

export async function removeMember(tx: DbOrTx, teamId: string, userId: string) {
  await tx.delete(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
}

export async function addMember(tx: DbOrTx, teamId: string, userId: string, role: Role) {
  await tx.insert(memberships).values({ teamId, userId, role });
}

export async function insertInvitation(
  db: DbOrTx,
  row: { teamId: string; email: string; role: Role; tokenHash: string; invitedBy: string; expiresAt: Date },
): Promise<string> {
  const id = newId('invite');
  await db.insert(invitations).values({ id, ...row });
  return id;
}

export function listPendingInvitations(db: DbOrTx, teamId: string) {
  return db
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      createdAt: invitations.createdAt,
      expiresAt: invitations.expiresAt,
      invitedByName: users.name,
    })
    .from(invitations)
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(and(eq(invitations.teamId, teamId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, sql`now()`)))
    .orderBy(desc(invitations.createdAt));
}

export function findInvitationById(db: DbOrTx, id: string) {
  return db.query.invitations.findFirst({ where: eq(invitations.id, id) });
}

export function findInvitationByTokenHash(db: DbOrTx, tokenHash: string) {
  return db.query.invitations.findFirst({ where: eq(invitations.tokenHash, tokenHash) });
}

/** Marks an invitation used; returns false when someone else used it first (single use). */
export async function consumeInvitation(tx: Tx, id: string, userId: string): Promise<boolean> {
  const rows = await tx
    .update(invitations)
    .set({ acceptedAt: sql`now()`, acceptedBy: userId })
    .where(and(eq(invitations.id, id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
    .returning({ id: invitations.id });
  return rows.length === 1;
}

export async function revokeInvitation(db: DbOrTx, id: string) {
  await db.update(invitations).set({ revokedAt: sql`now()` }).where(eq(invitations.id, id));
}

export async function recordAudit(
  db: DbOrTx,
  event: { teamId: string; actorId: string | null; action: string; targetUserId?: string | null; targetEmail?: string | null; detail?: Record<string, unknown> },
) {
  await db.insert(auditEvents).values({
    id: newId('audit'),
    teamId: event.teamId,
    actorId: event.actorId,
    action: event.action,
    targetUserId: event.targetUserId ?? null,
    targetEmail: event.targetEmail ?? null,
    detail: event.detail ?? {},
  });
}

export async function listAudit(db: Db, teamId: string, page: { limit: number; offset: number }) {
  const actor = users;
  const rows = await db
    .select({
      id: auditEvents.id,
      action: auditEvents.action,
      actorName: actor.name,
      targetEmail: auditEvents.targetEmail,
      targetUserId: auditEvents.targetUserId,
      detail: auditEvents.detail,
      createdAt: auditEvents.createdAt,
    })
    .from(auditEvents)
    .leftJoin(actor, eq(actor.id, auditEvents.actorId))
    .where(eq(auditEvents.teamId, teamId))
    .orderBy(desc(auditEvents.createdAt), desc(auditEvents.id))
    .limit(page.limit)
    .offset(page.offset);
  const [{ total }] = await db.select({ total: count() }).from(auditEvents).where(eq(auditEvents.teamId, teamId));
  return { rows, total };
}
