import { Router, type Request } from 'express';
import type { Passport } from 'passport';
import type { Db } from '../../db/client.ts';
import { HttpError } from '../../http/errors.ts';
import { parseOr400 } from '../../http/validate.ts';
import { signInSchema, signUpSchema, type Me } from '../../../shared/model/auth.ts';
import { createUserWithTeam, findUserByEmail, listMembershipsOf } from './repository.ts';
import { hashPassword } from '../../auth/passwords.ts';
import type { SessionUser } from '../../auth/passport.ts';

type PassportInstance = InstanceType<typeof Passport>;

/** req.login as a promise. passport ≥ 0.6 regenerates the session id here (no fixation). */
function logIn(req: Request, user: SessionUser): Promise<void> {
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

async function describeMe(db: Db, user: SessionUser): Promise<Me> {
  const teams = await listMembershipsOf(db, user.id);
  return { user: { id: user.id, email: user.email, name: user.name }, teams };
}

export function authRouter(db: Db, passport: PassportInstance): Router {
  const router = Router();

  router.post('/sign-in', async (req, res, next) => {
    const body = parseOr400(signInSchema, req.body);
    req.body = body; // normalised e-mail for the strategy
    passport.authenticate('local', async (err: unknown, user: SessionUser | false) => {
      try {
        if (err) throw err;
        if (!user) throw new HttpError(401, 'bad_credentials', 'That e-mail and password do not match an account.');
        await logIn(req, user);
        res.json(await describeMe(db, user));
      } catch (e) {
        next(e);
      }
    })(req, res, next);
  });

  router.post('/sign-up', async (req, res) => {
    const body = parseOr400(signUpSchema, req.body);
    if (await findUserByEmail(db, body.email)) {
      throw new HttpError(409, 'email_taken', 'An account with that e-mail already exists; sign in instead.');
    }
    const { userId } = await createUserWithTeam(db, {
      email: body.email,
      name: body.name,
      teamName: body.teamName,
      passwordHash: await hashPassword(body.password),
    });
    const user = { id: userId, email: body.email, name: body.name };
    await logIn(req, user);
    res.status(201).json(await describeMe(db, user));
  });

  router.post('/sign-out', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy(() => {
        res.clearCookie('sw.sid');
        res.status(204).end();
      });
    });
  });

  router.get('/me', async (req, res) => {
    if (!req.user) throw new HttpError(401, 'signed_out', 'Sign in to continue.');
    res.json(await describeMe(db, req.user));
  });

  return router;
}
