import { Router, type Request, type RequestHandler } from 'express';
import type { Passport } from 'passport';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { parseOr400 } from '../../http/validate.ts';
import { signInSchema, signUpSchema } from '../../../shared/model/auth.ts';
import { acceptInvitationSchema, resetConfirmSchema, resetRequestSchema, tokenSchema } from '../../../shared/model/teams.ts';
import type { SessionUser } from '../../auth/passport.ts';
import { SESSION_COOKIE } from '../../auth/session.ts';
import * as service from './service.ts';
import { idSchema } from '../../../shared/model/ids.ts';

export { RESET_REQUEST_ANSWER } from './service.ts';

type PassportInstance = InstanceType<typeof Passport>;

/** req.login as a promise. passport ≥ 0.6 regenerates the session id here (no fixation). */
function logIn(req: Request, user: SessionUser): Promise<void> {
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

const invitationRef = z.object({ teamId: idSchema('team'), token: tokenSchema });
const signUpConfirmSchema = z.object({ token: tokenSchema });

export interface AuthLimits {
  /** Failed sign-ins, per account and device or address (see server/http/rateLimit.ts). */
  signIn: RequestHandler[];
  /** Sign-ups per address. */
  signUp: RequestHandler;
  /** Password-reset requests per address. */
  reset: RequestHandler;
  /** Called after a successful sign-in: marks this browser as a known device of the account. */
  rememberDevice: (req: Request, res: import('express').Response, email: string) => void;
}

/** Sign-up/in/out, password reset and invitation acceptance: mounted at /api/auth. */
export function authRouter(ctx: AppContext, passport: PassportInstance, limits: AuthLimits): Router {
  const router = Router();

  router.post('/sign-in', ...limits.signIn, async (req, res, next) => {
    const body = parseOr400(signInSchema, req.body);
    req.body = body; // normalised e-mail for the strategy
    passport.authenticate('local', async (err: unknown, user: SessionUser | false) => {
      try {
        if (err) throw err;
        if (!user) throw new HttpError(401, 'bad_credentials', 'That e-mail and password do not match an account.');
        await logIn(req, user);
        limits.rememberDevice(req, res, user.email);
        res.json(await service.describeMe(ctx, user));
      } catch (e) {
        next(e);
      }
    })(req, res, next);
  });

  /** Step one: the same 202 whether or not the address has an account. */
  router.post('/sign-up', limits.signUp, async (req, res) => {
    const body = parseOr400(signUpSchema, req.body);
    await service.signUp(ctx, body);
    res.status(202).json({ message: service.signUpAnswer(body.email) });
  });

  /** Step two: the link from the e-mail; creates the account and signs it in. */
  router.post('/sign-up/confirm', async (req, res) => {
    const { token } = parseOr400(signUpConfirmSchema, req.body);
    const user = await service.confirmSignUp(ctx, token);
    await logIn(req, user);
    res.status(201).json(await service.describeMe(ctx, user));
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
    res.json(await service.describeMe(ctx, req.user));
  });

  router.post('/password-reset', limits.reset, async (req, res) => {
    const { email } = parseOr400(resetRequestSchema, req.body);
    await service.requestPasswordReset(ctx, email);
    res.status(202).json({ message: service.RESET_REQUEST_ANSWER });
  });

  router.post('/password-reset/confirm', async (req, res) => {
    const { token, password } = parseOr400(resetConfirmSchema, req.body);
    const user = await service.confirmPasswordReset(ctx, token, password);
    await logIn(req, user);
    res.json(await service.describeMe(ctx, user));
  });

  router.post('/invitations/preview', async (req, res) => {
    const { teamId, token } = parseOr400(invitationRef, req.body);
    res.json(await service.previewInvitation(ctx, teamId, token));
  });

  router.post('/invitations/accept', async (req, res) => {
    const input = parseOr400(acceptInvitationSchema.extend({ teamId: invitationRef.shape.teamId }), req.body);
    const user = await service.acceptInvitation(ctx, input, req.user ?? null);
    if (!req.user) await logIn(req, user);
    res.json(await service.describeMe(ctx, user));
  });

  return router;
}
