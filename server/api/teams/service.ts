import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { assertTeamRole } from '../../auth/guards.ts';
import { hashToken, INVITATION_TTL_MS, newToken } from '../../auth/tokens.ts';
import { invitationMail } from '../../mail/templates.ts';
import { findUserByEmail, findUserById } from '../auth/repository.ts';
import type { Role } from '../../../shared/model/roles.ts';
import type { AuditEntry, InvitationPreview, Member, PendingInvitation } from '../../../shared/model/teams.ts';
import * as repo from './repository.ts';

export async function createTeam(ctx: AppContext, userId: string, name: string): Promise<{ teamId: string; teamName: string; role: Role }> {
  const teamId = await repo.createTeam(ctx.db, name, userId);
  return { teamId, teamName: name, role: 'owner' };
}

export async function deleteTeam(ctx: AppContext, userId: string, teamId: string): Promise<void> {
  await assertTeamRole(ctx.db, userId, teamId, 'owner', 'delete the team');
  await repo.deleteTeam(ctx.db, teamId);
  ctx.events.emit('accessChanged', { teamId });
}

export async function listMembers(ctx: AppContext, userId: string, teamId: string): Promise<Member[]> {
  await assertTeamRole(ctx.db, userId, teamId, 'viewer', 'see the team’s members');
  const rows = await repo.listMembers(ctx.db, teamId);
  return rows.map((r) => ({ ...r, since: r.since.toISOString() }));
}

/**
 * Changes a member's role. The team must keep at least one owner: the owner rows are locked in
 * the same transaction, so two owners demoting each other at once cannot both succeed.
 */
export async function changeRole(ctx: AppContext, actorId: string, teamId: string, targetId: string, role: Role): Promise<Member[]> {
  await assertTeamRole(ctx.db, actorId, teamId, 'owner', 'change roles');
  await ctx.db.transaction(async (tx) => {
    const target = await repo.findMembership(tx, teamId, targetId);
    if (!target) throw new HttpError(404, 'not_found', 'That person is not a member of this team.');
    if (target.role === role) return;
    if (target.role === 'owner') {
      const owners = await repo.countOwnersForUpdate(tx, teamId);
      if (owners <= 1) throw new HttpError(409, 'last_owner', 'The team needs at least one owner: make someone else an owner first.');
    }
    await repo.setRole(tx, teamId, targetId, role);
    const user = await findUserById(ctx.db, targetId);
    await repo.recordAudit(tx, {
      teamId,
      actorId,
      action: 'member.role_changed',
      targetUserId: targetId,
      targetEmail: user?.email ?? null,
      detail: { name: user?.name ?? null, from: target.role, to: role },
    });
  });
  ctx.events.emit('accessChanged', { userId: targetId, teamId });
  return listMembers(ctx, actorId, teamId);
}

/** Removes a member (owners), or lets any member leave. The last owner can do neither. */
export async function removeMember(ctx: AppContext, actorId: string, teamId: string, targetId: string): Promise<void> {
  if (actorId !== targetId) await assertTeamRole(ctx.db, actorId, teamId, 'owner', 'remove members');
  else await assertTeamRole(ctx.db, actorId, teamId, 'viewer', 'leave the team');
  await ctx.db.transaction(async (tx) => {
    const target = await repo.findMembership(tx, teamId, targetId);
    if (!target) throw new HttpError(404, 'not_found', 'That person is not a member of this team.');
    if (target.role === 'owner') {
      const owners = await repo.countOwnersForUpdate(tx, teamId);
      if (owners <= 1) throw new HttpError(409, 'last_owner', 'The last owner cannot be removed: make someone else an owner first.');
    }
    await repo.removeMember(tx, teamId, targetId);
    const user = await findUserById(ctx.db, targetId);
    await repo.recordAudit(tx, {
      teamId,
      actorId,
      action: actorId === targetId ? 'member.left' : 'member.removed',
      targetUserId: targetId,
      targetEmail: user?.email ?? null,
      detail: { name: user?.name ?? null, role: target.role },
    });
  });
  ctx.events.emit('accessChanged', { userId: targetId, teamId });
}

export async function invite(ctx: AppContext, actorId: string, teamId: string, input: { email: string; role: Role }): Promise<PendingInvitation> {
  await assertTeamRole(ctx.db, actorId, teamId, 'owner', 'invite members');
  const team = await repo.findTeam(ctx.db, teamId);
  const actor = await findUserById(ctx.db, actorId);
  if (!team || !actor) throw new HttpError(404, 'not_found', 'No such team.');
  const existing = await findUserByEmail(ctx.db, input.email);
  if (existing && (await repo.findMembership(ctx.db, teamId, existing.id))) {
    throw new HttpError(409, 'already_member', `${input.email} is already a member of ${team.name}.`);
  }
  const { token, hash } = newToken();
  const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
  const id = await ctx.db.transaction(async (tx) => {
    const id = await repo.insertInvitation(tx, { teamId, email: input.email, role: input.role, tokenHash: hash, invitedBy: actorId, expiresAt });
    await repo.recordAudit(tx, { teamId, actorId, action: 'member.invited', targetEmail: input.email, detail: { role: input.role } });
    return id;
  });
  const url = `${ctx.publicUrl()}/invitations/accept?team=${encodeURIComponent(teamId)}&token=${encodeURIComponent(token)}`;
  try {
    await ctx.mailer.send(input.email, invitationMail({ teamName: team.name, inviterName: actor.name, role: input.role, url, expiresAt }));
  } catch (err) {
    ctx.log(`[mail] invitation to ${input.email} failed: ${(err as Error).message}`);
    throw new HttpError(502, 'mail_failed', `The invitation is saved but the e-mail to ${input.email} could not be sent; withdraw it and try again later.`);
  }
  return { id, email: input.email, role: input.role, createdAt: new Date().toISOString(), expiresAt: expiresAt.toISOString(), invitedByName: actor.name };
}

export async function listInvitations(ctx: AppContext, actorId: string, teamId: string): Promise<PendingInvitation[]> {
  await assertTeamRole(ctx.db, actorId, teamId, 'owner', 'see pending invitations');
  const rows = await repo.listPendingInvitations(ctx.db, teamId);
  return rows.map((r) => ({ ...r, createdAt: r.createdAt.toISOString(), expiresAt: r.expiresAt.toISOString() }));
}

export async function revokeInvitation(ctx: AppContext, actorId: string, teamId: string, invitationId: string): Promise<void> {
  await assertTeamRole(ctx.db, actorId, teamId, 'owner', 'revoke invitations');
  const inv = await repo.findInvitationById(ctx.db, invitationId);
  if (!inv || inv.teamId !== teamId) throw new HttpError(404, 'not_found', 'No such invitation in this team.');
  if (inv.acceptedAt) throw new HttpError(409, 'invitation_used', 'That invitation has already been accepted.');
  await repo.revokeInvitation(ctx.db, invitationId);
  await repo.recordAudit(ctx.db, { teamId, actorId, action: 'invitation.revoked', targetEmail: inv.email, detail: { role: inv.role } });
}

/**
 * Finds a usable invitation from the link's team and token. Every way a link can be wrong gets
 * its own plain answer: unknown (or for another team), already used, revoked, expired.
 */
async function usableInvitation(ctx: AppContext, teamId: string, token: string) {
  const inv = await repo.findInvitationByTokenHash(ctx.db, hashToken(token));
  if (!inv || inv.teamId !== teamId) throw new HttpError(404, 'invitation_not_found', 'This invitation link is not valid. Ask the team owner for a new one.');
  if (inv.acceptedAt) throw new HttpError(410, 'invitation_used', 'This invitation has already been used.');
  if (inv.revokedAt) throw new HttpError(410, 'invitation_revoked', 'This invitation was withdrawn by the team owner.');
  if (inv.expiresAt.getTime() <= Date.now()) throw new HttpError(410, 'invitation_expired', 'This invitation has expired. Ask the team owner for a new one.');
  return inv;
}

export async function previewInvitation(ctx: AppContext, teamId: string, token: string): Promise<InvitationPreview> {
  const inv = await usableInvitation(ctx, teamId, token);
  const team = await repo.findTeam(ctx.db, teamId);
  const inviter = inv.invitedBy ? await findUserById(ctx.db, inv.invitedBy) : undefined;
  return {
    teamId,
    teamName: team?.name ?? '',
    email: inv.email,
    role: inv.role,
    invitedByName: inviter?.name ?? null,
    expiresAt: inv.expiresAt.toISOString(),
    accountExists: Boolean(await findUserByEmail(ctx.db, inv.email)),
  };
}

/**
 * Accepts an invitation for `userId` (already signed in, or just created). The invitation is
 * bound to the e-mail it was sent to; it is consumed in the same transaction that adds the
 * membership, so it can be used only once even when two tabs race.
 */
export async function acceptInvitation(ctx: AppContext, teamId: string, token: string, user: { id: string; email: string }): Promise<void> {
  const inv = await usableInvitation(ctx, teamId, token);
  if (inv.email !== user.email) {
    throw new HttpError(403, 'invitation_other_email', `This invitation was sent to ${inv.email}; sign in with that address to accept it.`);
  }
  await ctx.db.transaction(async (tx) => {
    if (!(await repo.consumeInvitation(tx, inv.id, user.id))) {
      throw new HttpError(410, 'invitation_used', 'This invitation has already been used.');
    }
    const existing = await repo.findMembership(tx, teamId, user.id);
    if (existing) throw new HttpError(409, 'already_member', 'You are already a member of this team.');
    await repo.addMember(tx, teamId, user.id, inv.role);
    await repo.recordAudit(tx, { teamId, actorId: user.id, action: 'invitation.accepted', targetUserId: user.id, targetEmail: user.email, detail: { role: inv.role } });
  });
}

const ACTION_WORDS: Record<string, (e: { actorName: string | null; targetEmail: string | null; detail: Record<string, unknown> }) => string> = {
  'team.created': (e) => `${e.actorName ?? 'Someone'} created the team.`,
  'member.invited': (e) => `${e.actorName ?? 'Someone'} invited ${e.targetEmail} as ${String(e.detail.role)}.`,
  'invitation.revoked': (e) => `${e.actorName ?? 'Someone'} withdrew the invitation to ${e.targetEmail}.`,
  'invitation.accepted': (e) => `${e.targetEmail} joined as ${String(e.detail.role)}.`,
  'member.role_changed': (e) => `${e.actorName ?? 'Someone'} changed ${String(e.detail.name ?? e.targetEmail)} from ${String(e.detail.from)} to ${String(e.detail.to)}.`,
  'member.removed': (e) => `${e.actorName ?? 'Someone'} removed ${String(e.detail.name ?? e.targetEmail)} (${String(e.detail.role)}).`,
  'member.left': (e) => `${String(e.detail.name ?? e.targetEmail)} left the team.`,
};

export async function listAudit(ctx: AppContext, actorId: string, teamId: string, page: { limit: number; offset: number }) {
  await assertTeamRole(ctx.db, actorId, teamId, 'owner', 'see the audit trail');
  const { rows, total } = await repo.listAudit(ctx.db, teamId, page);
  const items: AuditEntry[] = rows.map((r) => {
    const detail = (r.detail ?? {}) as Record<string, unknown>;
    const words = ACTION_WORDS[r.action];
    return {
      id: r.id,
      action: r.action,
      actorName: r.actorName,
      targetEmail: r.targetEmail,
      detail,
      createdAt: r.createdAt.toISOString(),
      summary: words ? words({ actorName: r.actorName, targetEmail: r.targetEmail, detail }) : r.action,
    };
  });
  return { items, total, ...page };
}
