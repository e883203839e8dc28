import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { assertTeamRole } from '../../auth/guards.ts';
import { hashToken, INVITATION_TTL_MS, newToken } from '../../auth/tokens.ts';
import { invitationMail } from '../../mail/templates.ts';
import { findUserByEmail, findUserById } from '../auth/repository.ts';
import type { Role } from '../../../shared/model/roles.ts';
import type { AuditAction, AuditEntry, InvitationPreview, Member, PendingInvitation } from '../../../shared/model/teams.ts';
import * as repo from './repository.ts';
import { errorForLog } from '../../log.ts';

export async function createTeam(ctx: AppContext, userId: string, name: string): Promise<{ teamId: string; teamName: string; role: Role }> {
  const teamId = await repo.createTeam(ctx.db, name, userId);
  ctx.events.emit('teamsChanged', userId);
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
 * Changes a member's role. The team keeps at least one owner (the repository locks the owner
 * rows, so two owners demoting each other at once cannot both succeed); an owner who is demoted
 * has their pending invitations withdrawn. Open sockets of that person re-check their role.
 */
export async function changeRole(ctx: AppContext, actorId: string, teamId: string, targetId: string, role: Role): Promise<Member[]> {
  await assertTeamRole(ctx.db, actorId, teamId, 'owner', 'change roles');
  const change = await repo.changeRoleAtomically(ctx.db, { teamId, actorId, targetId, role });
  if (!change.ok && change.reason === 'not_member') throw new HttpError(404, 'not_found', 'That person is not a member of this team.');
  if (!change.ok) throw new HttpError(409, 'last_owner', 'The team needs at least one owner: make someone else an owner first.');
  ctx.events.emit('accessChanged', { userId: targetId, teamId });
  return listMembers(ctx, actorId, teamId);
}

/**
 * Removes a member (owners), or lets any member leave. The last owner can do neither. Their
 * pending invitations are withdrawn with them, and their open sockets leave the team's sketches.
 */
export async function removeMember(ctx: AppContext, actorId: string, teamId: string, targetId: string): Promise<void> {
  if (actorId !== targetId) await assertTeamRole(ctx.db, actorId, teamId, 'owner', 'remove members');
  else await assertTeamRole(ctx.db, actorId, teamId, 'viewer', 'leave the team');
  const change = await repo.removeMemberAtomically(ctx.db, { teamId, actorId, targetId });
  if (!change.ok && change.reason === 'not_member') throw new HttpError(404, 'not_found', 'That person is not a member of this team.');
  if (!change.ok) throw new HttpError(409, 'last_owner', 'The last owner cannot be removed: make someone else an owner first.');
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
  const id = await repo.createInvitationAtomically(ctx.db, { teamId, email: input.email, role: input.role, tokenHash: hash, invitedBy: actorId, expiresAt });
  const url = `${ctx.publicUrl()}/invitations/accept?team=${encodeURIComponent(teamId)}&token=${encodeURIComponent(token)}`;
  try {
    await ctx.mailer.send(input.email, invitationMail({ teamName: team.name, inviterName: actor.name, role: input.role, url, expiresAt }));
  } catch (err) {
    ctx.log(`[mail] invitation ${id} could not be sent: ${errorForLog(err, false)}`);
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
  await repo.revokeInvitationAtomically(ctx.db, { id: invitationId, teamId, actorId, email: inv.email, role: inv.role });
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
 * Accepts an invitation as `user` (signed in), or — `newcomer` — as a new account for the
 * invited address, created in the same transaction (a refused acceptance leaves no account).
 * The invitation is bound to the e-mail it was sent to and consumed with the membership, so it
 * works once even when two tabs race. Returns the id of the member.
 */
export async function acceptInvitation(
  ctx: AppContext,
  teamId: string,
  token: string,
  who: { user: { id: string; email: string } } | { newcomer: { name: string; passwordHash: string } },
): Promise<{ userId: string; email: string }> {
  const inv = await usableInvitation(ctx, teamId, token);
  if ('user' in who && inv.email !== who.user.email) {
    throw new HttpError(403, 'invitation_other_email', `This invitation was sent to ${inv.email}; sign in with that address to accept it.`);
  }
  const result = await repo.acceptInvitationAtomically(ctx.db, {
    invitationId: inv.id,
    teamId,
    role: inv.role,
    email: inv.email,
    ...('user' in who ? { userId: who.user.id } : { newUser: who.newcomer }),
  });
  if (!result.ok && result.reason === 'used') throw new HttpError(410, 'invitation_used', 'This invitation has already been used.');
  if (!result.ok) throw new HttpError(409, 'already_member', 'You are already a member of this team.');
  ctx.events.emit('teamsChanged', result.userId);
  return { userId: result.userId, email: inv.email };
}

const ACTION_WORDS: Record<AuditAction, (e: { actorName: string | null; targetEmail: string | null; detail: Record<string, unknown> }) => string> = {
  'team.created': (e) => `${e.actorName ?? 'Someone'} created the team.`,
  'member.invited': (e) => `${e.actorName ?? 'Someone'} invited ${e.targetEmail} as ${String(e.detail.role)}.`,
  'invitation.revoked': (e) =>
    e.detail.reason ? `The invitation to ${e.targetEmail} was withdrawn: ${String(e.detail.reason)}.` : `${e.actorName ?? 'Someone'} withdrew the invitation to ${e.targetEmail}.`,
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
    return {
      id: r.id,
      action: r.action,
      actorName: r.actorName,
      targetEmail: r.targetEmail,
      detail,
      createdAt: r.createdAt.toISOString(),
      summary: ACTION_WORDS[r.action]({ actorName: r.actorName, targetEmail: r.targetEmail, detail }),
    };
  });
  return { items, total, ...page };
}
