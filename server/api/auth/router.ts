import { Router, type Request, type RequestHandler } from 'express';
import type { Passport } from 'passport';
import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { parseOr400 } from '../../http/validate.ts';
import { signInSchema, signUpSchema, type Me } from '../../../shared/model/auth.ts';
import { acceptInvitationSchema, resetConfirmSchema, resetRequestSchema, tokenSchema } from '../../../shared/model/teams.ts';
import { z } from 'zod';
import * as repo from './repository.ts';
import { hashPassword } from '../../auth/passwords.ts';
import type { SessionUser } from '../../auth/passport.ts';
import { hashToken, newToken, PASSWORD_RESET_TTL_MS } from '../../auth/tokens.ts';
import { passwordResetMail } from '../../mail/templates.ts';
import { SESSION_COOKIE } from '../../auth/session.ts';
import * as teams from '../teams/service.ts';

type PassportInstance = InstanceType<typeof Passport>;

/** req.login as a promise. passport ≥ 0.6 regenerates the session id here (no fixation). */
function logIn(req: Request, user: SessionUser): Promise<void> {
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

async function describeMe(ctx: AppContext, user: SessionUser): Promise<Me> {
  const memberships = await repo.listMembershipsOf(ctx.db, user.id);
  return { user: { id: user.id, email: user.email, name: user.name }, teams: memberships, devMailbox: ctx.devPages };
}

const invitationRef = z.object({ teamId: z.string().regex(/^team_[a-z0-9]{20}$/, 'must be a team id'), token: tokenSchema });

export const RESET_REQUEST_ANSWER = 'If an account uses that address, a link to choose a new password is on its way. It works once, for one hour.';

export interface AuthLimits {
  signIn: RequestHandler;
  reset: RequestHandler;
}

/** Sign-up/in/out, password reset and invitation acceptance: mounted at /api/auth. */
export function authRouter(ctx: AppContext, passport: PassportInstance, limits: AuthLimits): Router {
  const router = Router();

  router.post('/sign-in', limits.signIn, async (req, res, next) => {
    const body = parseOr400(signInSchema, req.body);
    req.body = body; // normalised e-mail for the strategy
    passport.authenticate('local', async (err: unknown, user: SessionUser | false) => {
      try {
        if (err) throw err;
        if (!user) throw new HttpError(401, 'bad_credentials', 'That e-mail and password do not match an account.');
        await logIn(req, user);
        res.json(await describeMe(ctx, user));
      } catch (e) {
        next(e);
      }
    })(req, res, next);
  });

  router.post('/sign-up', async (req, res) => {
    const body = parseOr400(signUpSchema, req.body);
    if (await repo.findUserByEmail(ctx.db, body.email)) {
      throw new HttpError(409, 'email_taken', 'An account with that e-mail already exists; sign in instead.');
    }
    const { userId } = await repo.createUserWithTeam(ctx.db, {
      email: body.email,
      name: body.name,
      teamName: body.teamName,
      passwordHash: await hashPassword(body.password),
    });
    const user = { id: userId, email: body.email, name: body.name };
    await logIn(req, user);
    res.status(201).json(await describeMe(ctx, user));
  });

  router.post('/sign-out', (req, res, next) => {
    const userId = req.user?.id;
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy(() => {
        // Open sockets of this session are hung up (they re-check and find it gone).
        if (userId) ctx.events.emit('accessChanged', { userId });
        res.clearCookie(SESSION_COOKIE);
        res.status(204).end();
      });
    });
  });

  router.get('/me', async (req, res) => {
    if (!req.user) throw new HttpError(401, 'signed_out', 'Sign in to continue.');
    res.json(await describeMe(ctx, req.user));
  });

  /** Same answer whether or not the address has an account (no account discovery). */
  router.post('/password-reset', limits.reset, async (req, res) => {
    const { email } = parseOr400(resetRequestSchema, req.body);
    const user = await repo.findUserByEmail(ctx.db, email);
    if (user) {
      const { token, hash } = newToken();
      await repo.insertPasswordReset(ctx.db, { userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + PASSWORD_RESET_TTL_MS) });
      const url = `${ctx.publicUrl()}/reset-password?token=${encodeURIComponent(token)}`;
      // Sending must not change the answer or its timing much; failures are logged only.
      ctx.mailer.send(user.email, passwordResetMail({ name: user.name, url })).catch((err) => ctx.log(`[mail] reset for ${user.email} failed: ${(err as Error).message}`));
    }
    res.status(202).json({ message: RESET_REQUEST_ANSWER });
  });

  router.post('/password-reset/confirm', limits.reset, async (req, res) => {
    const { token, password } = parseOr400(resetConfirmSchema, req.body);
    const reset = await repo.findPasswordReset(ctx.db, hashToken(token));
    if (!reset) throw new HttpError(400, 'reset_invalid', 'This reset link is not valid. Ask for a new one.');
    if (reset.usedAt) throw new HttpError(410, 'reset_used', 'This reset link has already been used. Ask for a new one.');
    if (reset.expiresAt.getTime() <= Date.now()) throw new HttpError(410, 'reset_expired', 'This reset link has expired (links last one hour). Ask for a new one.');
    const user = await repo.findUserById(ctx.db, reset.userId);
    if (!user) throw new HttpError(400, 'reset_invalid', 'This reset link is not valid. Ask for a new one.');
    await repo.updatePassword(ctx.db, user.id, await hashPassword(password));
    await repo.consumePasswordResets(ctx.db, user.id);
    await repo.deleteSessionsOf(ctx.db, user.id);
    ctx.events.emit('accessChanged', { userId: user.id });
    await logIn(req, { id: user.id, email: user.email, name: user.name });
    res.json(await describeMe(ctx, { id: user.id, email: user.email, name: user.name }));
  });

  router.post('/invitations/preview', async (req, res) => {
    const { teamId, token } = parseOr400(invitationRef, req.body);
    res.json(await teams.previewInvitation(ctx, teamId, token));
  });

  /**
   * Accepts an invitation. Signed in: joins as that account (must be the invited address). Not
   * signed in and no account for the address: creates one (name + password) and signs it in.
   */
  router.post('/invitations/accept', async (req, res) => {
    const { teamId, token, name, password } = parseOr400(acceptInvitationSchema.extend({ teamId: invitationRef.shape.teamId }), req.body);
    let user = req.user ?? null;
    if (!user) {
      const preview = await teams.previewInvitation(ctx, teamId, token);
      if (preview.accountExists) throw new HttpError(409, 'sign_in_required', `An account for ${preview.email} exists: sign in first, then open the link again.`);
      if (!name || !password) throw new HttpError(400, 'invalid_input', 'Invalid body: name and password are needed to create your account.');
      const id = await repo.createUser(ctx.db, { email: preview.email, name, passwordHash: await hashPassword(password) });
      user = { id, email: preview.email, name };
      try {
        await teams.acceptInvitation(ctx, teamId, token, user);
      } finally {
        await logIn(req, user);
      }
    } else {
      await teams.acceptInvitation(ctx, teamId, token, user);
    }
    res.json(await describeMe(ctx, user));
  });

  return router;
}
