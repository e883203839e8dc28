import type { Request, RequestHandler } from 'express';
import type { Db } from '../db/client.ts';
import { HttpError } from '../http/errors.ts';
import { findRole } from '../api/auth/repository.ts';
import { ROLE_PURPOSE, roleAtLeast, type Role } from '../../shared/model/roles.ts';
import type { SessionUser } from './passport.ts';

/** The signed-in user, or a 401 that the client turns into a trip to sign-in. */
export function currentUser(req: Request): SessionUser {
  if (!req.user) throw new HttpError(401, 'signed_out', 'Sign in to continue.');
  return req.user;
}

export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(new HttpError(401, 'signed_out', 'Sign in to continue.'));
  next();
};

/**
 * Checks that `userId` holds at least `needed` in `teamId`. A non-member gets 404 with `notMember`
 * (the team's existence is not revealed); a member with too small a role gets 403 naming the role needed.
 */
export async function assertTeamRole(db: Db, userId: string, teamId: string, needed: Role, what = 'do this', notMember = 'No such team, or you are not a member of it.'): Promise<Role> {
  const role = await findRole(db, userId, teamId);
  if (!role) throw new HttpError(404, 'not_found', notMember);
  if (!roleAtLeast(role, needed)) {
    throw new HttpError(403, 'forbidden', `You need the ${needed} role (or higher) to ${what}; your role in this team is ${role}. A team owner can change roles.`, { needed, role });
  }
  return role;
}

export { ROLE_PURPOSE };
