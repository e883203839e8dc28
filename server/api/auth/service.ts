import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { hashPassword } from '../../auth/passwords.ts';
import type { SessionUser } from '../../auth/passport.ts';
import { hashToken, newToken, PASSWORD_RESET_TTL_MS, SIGN_UP_TTL_MS } from '../../auth/tokens.ts';
import { accountExistsMail, confirmSignUpMail, passwordResetMail, type MailContent } from '../../mail/templates.ts';
import { errorForLog } from '../../log.ts';
import type { Me, SignUp } from '../../../shared/model/auth.ts';
import * as teams from '../teams/service.ts';
import * as repo from './repository.ts';

/**
 * Accounts: sign-up (in two steps), password reset, invitations accepted by newcomers, and the
 * `me` answer. The router handles the session (passport's req.login); everything else is here.
 */

export const RESET_REQUEST_ANSWER = 'If an account uses that address, a link to choose a new password is on its way. It works once, for one hour.';

/** The one answer to every sign-up, whether or not the address has an account. */
export function signUpAnswer(email: string): string {
  return `Check your inbox at ${email}: a link to finish signing up is on its way (it works once, for 24 hours). If this address already has an account, the message says so instead.`;
}

/** Sends without waiting: the answer (and its timing) must not depend on the mail; failures are logged. */
function sendLater(ctx: AppContext, to: string, content: MailContent, what: string): void {
  ctx.mailer.send(to, content).catch((err) => ctx.log(`[mail] ${what} could not be sent: ${errorForLog(err, false)}`));
}

export async function describeMe(ctx: AppContext, user: SessionUser): Promise<Me> {
  const memberships = await repo.listMembershipsOf(ctx.db, user.id);
  return {
    user: { id: user.id, email: user.email, name: user.name },
    teams: memberships,
    devMailbox: ctx.devPages,
    mailboxOperator: ctx.devPages && ctx.mailboxOperators.has(user.email),
  };
}

/**
 * Sign-up, step one. The answer is the same whether or not the address has an account, so the
 * form cannot be used to find out who has one: a new address gets a confirmation link; the owner
 * of an existing account gets a notice instead. The password is hashed in both cases so the two
 * take as long.
 */
export async function signUp(ctx: AppContext, input: SignUp): Promise<void> {
  const passwordHash = await hashPassword(input.password);
  const existing = await repo.findUserByEmail(ctx.db, input.email);
  if (existing) {
    const base = ctx.publicUrl();
    sendLater(ctx, existing.email, accountExistsMail({ name: existing.name, signInUrl: `${base}/sign-in`, resetUrl: `${base}/forgot-password` }), 'account-exists notice');
    return;
  }
  const { token, hash } = newToken();
  await repo.insertSignUp(ctx.db, { email: input.email, name: input.name, teamName: input.teamName, passwordHash, tokenHash: hash, expiresAt: new Date(Date.now() + SIGN_UP_TTL_MS) });
  const url = `${ctx.publicUrl()}/confirm-sign-up?token=${encodeURIComponent(token)}`;
  sendLater(ctx, input.email, confirmSignUpMail({ name: input.name, teamName: input.teamName, url }), 'sign-up confirmation');
}

/**
 * Sign-up, step two: the link was followed, so the address is the person's. Creates the user and
 * their team (atomically) and returns who to sign in.
 */
export async function confirmSignUp(ctx: AppContext, token: string): Promise<SessionUser> {
  const pending = await repo.findSignUp(ctx.db, hashToken(token));
  if (!pending) throw new HttpError(400, 'signup_invalid', 'This sign-up link is not valid. Sign up again.');
  if (pending.usedAt) throw new HttpError(410, 'signup_used', 'This sign-up link has already been used: sign in instead.');
  if (pending.expiresAt.getTime() <= Date.now()) throw new HttpError(410, 'signup_expired', 'This sign-up link has expired (links last 24 hours). Sign up again.');
  const done = await repo.completeSignUp(ctx.db, pending.id);
  if (!done.ok && done.reason === 'used') throw new HttpError(410, 'signup_used', 'This sign-up link has already been used: sign in instead.');
  if (!done.ok) throw new HttpError(409, 'email_taken', 'email: an account with this address already exists; sign in instead.');
  return { id: done.userId, email: pending.email, name: pending.name };
}

/** Same answer whether or not the address has an account (no account discovery). */
export async function requestPasswordReset(ctx: AppContext, email: string): Promise<void> {
  const user = await repo.findUserByEmail(ctx.db, email);
  if (!user) return;
  const { token, hash } = newToken();
  await repo.insertPasswordReset(ctx.db, { userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + PASSWORD_RESET_TTL_MS) });
  const url = `${ctx.publicUrl()}/reset-password?token=${encodeURIComponent(token)}`;
  sendLater(ctx, user.email, passwordResetMail({ name: user.name, url }), 'password reset');
}

/**
 * A valid, unused, unexpired link always confirms (it is not rate limited: a 256-bit token
 * cannot be guessed). The password changes, other links die, every other session ends and open
 * sockets of those sessions are hung up.
 */
export async function confirmPasswordReset(ctx: AppContext, token: string, password: string): Promise<SessionUser> {
  const outcome = await repo.resetPasswordAtomically(ctx.db, { tokenHash: hashToken(token), passwordHash: await hashPassword(password) });
  if (!outcome.ok && outcome.reason === 'invalid') throw new HttpError(400, 'reset_invalid', 'This reset link is not valid. Ask for a new one.');
  if (!outcome.ok && outcome.reason === 'used') throw new HttpError(410, 'reset_used', 'This reset link has already been used. Ask for a new one.');
  if (!outcome.ok) throw new HttpError(410, 'reset_expired', 'This reset link has expired (links last one hour). Ask for a new one.');
  ctx.events.emit('accessChanged', { userId: outcome.user.id });
  return outcome.user;
}

/**
 * Accepts an invitation. Signed in: joins as that account (it must be the invited address). Not
 * signed in and no account for the address: creates one (name + password) together with the
 * membership. Returns who to sign in (the newcomer), or null when already signed in.
 */
export async function acceptInvitation(
  ctx: AppContext,
  input: { teamId: string; token: string; name?: string; password?: string },
  signedIn: SessionUser | null,
): Promise<SessionUser> {
  if (signedIn) {
    await teams.acceptInvitation(ctx, input.teamId, input.token, { user: signedIn });
    return signedIn;
  }
  const preview = await teams.previewInvitation(ctx, input.teamId, input.token);
  if (preview.accountExists) throw new HttpError(409, 'sign_in_required', `An account for ${preview.email} exists: sign in first, then open the link again.`);
  if (!input.name || !input.password) throw new HttpError(400, 'invalid_input', 'Invalid body: name and password are needed to create your account.');
  const joined = await teams.acceptInvitation(ctx, input.teamId, input.token, { newcomer: { name: input.name, passwordHash: await hashPassword(input.password) } });
  return { id: joined.userId, email: joined.email, name: input.name };
}

export const previewInvitation = teams.previewInvitation;
