import type { RequestHandler } from 'express';
import type { AuthService } from '../auth/auth.service.ts';
import { can, type Access } from '../auth/permissions.ts';
import { AppError } from '../lib/app-error.ts';
import type { User } from '../users/user.model.ts';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** The signed-in account, set by `authorize` on every route that is not public. */
      user?: User;
      /**
       * SQLite's data_version when `authorize` read the account: nothing committed since then
       * if it is still the same (db.dataVersion), for routes that cache their answers.
       */
      dataVersion?: number;
    }
  }
}

/** The guard in front of every route: who is calling, and may their role do this? */
export function authorize(auth: AuthService, access: Access): RequestHandler {
  if (access === 'public') return (_req, _res, next) => next();
  return async (req, _res, next) => {
    const { user, dataVersion } = await auth.authenticate(req.get('authorization'));
    req.user = user;
    req.dataVersion = dataVersion;
    if (access !== 'signed-in' && !can(user.role, access)) {
      throw new AppError(403, 'forbidden', `the ${user.role} role may not do this (it needs ${access})`);
    }
    next();
  };
}

/** The signed-in account of a route behind `authorize`. */
export function currentUser(req: Express.Request): User {
  if (!req.user) throw new AppError(401, 'unauthenticated', 'sign in first');
  return req.user;
}
