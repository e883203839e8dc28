import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Db } from '../db/client.ts';
import { findUserByEmail, findUserById } from '../api/auth/repository.ts';
import { decoyPasswordHash, verifyPassword } from './passwords.ts';

/** What the session keeps about the signed-in person (the rest is read per request). */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport augments Request.user with this type.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

/**
 * A passport instance (not the global singleton, so several apps can live in one test process)
 * with the local e-mail + password strategy. An unknown e-mail costs the same argon2 verify as
 * a known one, so the answer time does not reveal which addresses have accounts.
 */
export function createPassport(db: Db): InstanceType<typeof Passport> {
  const passport = new Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, async (email, password, done) => {
      try {
        const user = await findUserByEmail(db, email);
        if (!user) {
          await verifyPassword(await decoyPasswordHash(), password);
          return done(null, false);
        }
        if (!(await verifyPassword(user.passwordHash, password))) return done(null, false);
        return done(null, { id: user.id, email: user.email, name: user.name });
      } catch (err) {
        return done(err);
      }
    }),
  );
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser(async (id: string, done) => {
    try {
      const user = await findUserById(db, id);
      // A deleted user simply has no session any more.
      done(null, user ? { id: user.id, email: user.email, name: user.name } : false);
    } catch (err) {
      done(err);
    }
  });
  return passport;
}
