import { and, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import type { Db, DbOrTx, Tx } from '../../db/client.ts';
import { auditEvents, invitations, memberships, teams, users } from '../../db/schema.ts';
import { newId } from '../../../shared/model/ids.ts';
import type { Role } from '../../../shared/model/roles.ts';
import type { AuditAction } from '../../../shared/model/teams.ts';
import { createUser } from '../auth/repository.ts';


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
  event: { teamId: string; actorId: string | null; action: AuditAction; targetUserId?: string | null; targetEmail?: string | null; detail?: Record<string, unknown> },
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
  const total = await db.$count(auditEvents, eq(auditEvents.teamId, teamId));
  return { rows, total };
}

// ── Changes made atomically (services ask for "do X"; the transaction lives here) ─────────────

/** Withdraws the pending invitations `userId` sent in `teamId`; returns what was withdrawn. */
async function revokeInvitationsSentBy(tx: Tx, teamId: string, userId: string) {
  return tx
    .update(invitations)
    .set({ revokedAt: sql`now()` })
    .where(and(eq(invitations.teamId, teamId), eq(invitations.invitedBy, userId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, sql`now()`)))
    .returning({ email: invitations.email, role: invitations.role });
}

/** Audit rows for invitations withdrawn because their sender stopped being an owner. */
async function recordRevoked(tx: Tx, teamId: string, actorId: string, revoked: { email: string; role: Role }[], why: string) {
  for (const inv of revoked) {
    await recordAudit(tx, { teamId, actorId, action: 'invitation.revoked', targetEmail: inv.email, detail: { role: inv.role, reason: why } });
  }
}

export type MembershipChange = { ok: true; from: Role; revokedInvitations: number } | { ok: false; reason: 'not_member' | 'last_owner' };

/**
 * Changes a member's role, atomically: the owner rows are locked so two owners demoting each
 * other at once cannot both succeed; an owner who stops being one has their pending invitations
 * withdrawn with them (an invitation carries its sender's authority); everything is audited.
 */
export async function changeRoleAtomically(db: Db, input: { teamId: string; actorId: string; targetId: string; role: Role }): Promise<MembershipChange> {
  return db.transaction(async (tx) => {
    const target = await findMembership(tx, input.teamId, input.targetId);
    if (!target) return { ok: false, reason: 'not_member' } as const;
    if (target.role === input.role) return { ok: true, from: target.role, revokedInvitations: 0 } as const;
    if (target.role === 'owner' && (await countOwnersForUpdate(tx, input.teamId)) <= 1) return { ok: false, reason: 'last_owner' } as const;
    await setRole(tx, input.teamId, input.targetId, input.role);
    const user = await tx.query.users.findFirst({ where: eq(users.id, input.targetId), columns: { email: true, name: true } });
    await recordAudit(tx, {
      teamId: input.teamId,
      actorId: input.actorId,
      action: 'member.role_changed',
      targetUserId: input.targetId,
      targetEmail: user?.email ?? null,
      detail: { name: user?.name ?? null, from: target.role, to: input.role },
    });
    const revoked = target.role === 'owner' ? await revokeInvitationsSentBy(tx, input.teamId, input.targetId) : [];
    await recordRevoked(tx, input.teamId, input.actorId, revoked, 'its sender is no longer an owner');
    return { ok: true, from: target.role, revokedInvitations: revoked.length } as const;
  });
}

/**
 * Removes a member (or records that they left), atomically: the last owner cannot go; a
 * removed owner's pending invitations are withdrawn in the same transaction; audited.
 */
export async function removeMemberAtomically(db: Db, input: { teamId: string; actorId: string; targetId: string }): Promise<MembershipChange> {
  return db.transaction(async (tx) => {
    const target = await findMembership(tx, input.teamId, input.targetId);
    if (!target) return { ok: false, reason: 'not_member' } as const;
    if (target.role === 'owner' && (await countOwnersForUpdate(tx, input.teamId)) <= 1) return { ok: false, reason: 'last_owner' } as const;
    await removeMember(tx, input.teamId, input.targetId);
    const user = await tx.query.users.findFirst({ where: eq(users.id, input.targetId), columns: { email: true, name: true } });
    await recordAudit(tx, {
      teamId: input.teamId,
      actorId: input.actorId,
      action: input.actorId === input.targetId ? 'member.left' : 'member.removed',
      targetUserId: input.targetId,
      targetEmail: user?.email ?? null,
      detail: { name: user?.name ?? null, role: target.role },
    });
    const revoked = await revokeInvitationsSentBy(tx, input.teamId, input.targetId);
    await recordRevoked(tx, input.teamId, input.actorId, revoked, 'its sender left the team');
    return { ok: true, from: target.role, revokedInvitations: revoked.length } as const;
  });
}

/** Stores an invitation and its audit row together. */
export async function createInvitationAtomically(
  db: Db,
  row: { teamId: string; email: string; role: Role; tokenHash: string; invitedBy: string; expiresAt: Date },
): Promise<string> {
  return db.transaction(async (tx) => {
    const id = await insertInvitation(tx, row);
    await recordAudit(tx, { teamId: row.teamId, actorId: row.invitedBy, action: 'member.invited', targetEmail: row.email, detail: { role: row.role } });
    return id;
  });
}

/** Withdraws one invitation and audits it. */
export async function revokeInvitationAtomically(db: Db, input: { id: string; teamId: string; actorId: string; email: string; role: Role }): Promise<void> {
  await db.transaction(async (tx) => {
    await revokeInvitation(tx, input.id);
    await recordAudit(tx, { teamId: input.teamId, actorId: input.actorId, action: 'invitation.revoked', targetEmail: input.email, detail: { role: input.role } });
  });
}

export type Acceptance = { ok: true; userId: string } | { ok: false; reason: 'used' | 'already_member' };

/**
 * Accepts an invitation, atomically: for a newcomer the account is created in the same
 * transaction, so a refused acceptance leaves no account behind. The invitation is consumed
 * (single use, even when two tabs race) together with the new membership and its audit row.
 */
export async function acceptInvitationAtomically(
  db: Db,
  input: { invitationId: string; teamId: string; role: Role; email: string; userId?: string; newUser?: { name: string; passwordHash: string } },
): Promise<Acceptance> {
  return db
    .transaction(async (tx) => {
      const userId = input.userId ?? (await createUser(tx, { email: input.email, name: input.newUser!.name, passwordHash: input.newUser!.passwordHash }));
      if (!(await consumeInvitation(tx, input.invitationId, userId))) throw new Refused('used');
      if (await findMembership(tx, input.teamId, userId)) throw new Refused('already_member');
      await addMember(tx, input.teamId, userId, input.role);
      await recordAudit(tx, { teamId: input.teamId, actorId: userId, action: 'invitation.accepted', targetUserId: userId, targetEmail: input.email, detail: { role: input.role } });
      return { ok: true, userId } as const;
    })
    .catch((err) => {
      if (err instanceof Refused) return { ok: false, reason: err.reason } as const;
      throw err;
    });
}

/** Rolls a transaction back with a reason the caller turns into an answer. */
class Refused extends Error {
  constructor(readonly reason: 'used' | 'already_member') {
    super(reason);
  }
}
