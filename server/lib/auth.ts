import type { RequestHandler } from 'express';
import { hasRole, type Role } from '../../shared/domain/roles.js';
import type { SessionUser } from '../../shared/schemas/people.js';
import { forbidden, unauthenticated } from './errors.js';

declare module 'express-session' {
  interface SessionData {
    userId: number;
    csrfToken: string;
  }
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Locals {
      user?: SessionUser;
    }
  }
}

/**
 * Load the session's user on every request, so a role change or a deactivation takes effect at once.
 * A session whose user is gone or inactive is destroyed.
 */
export function loadSessionUser(findActiveUser: (id: number) => Promise<SessionUser | null>): RequestHandler {
  return async (req, res, next) => {
    const userId = req.session?.userId;
    if (userId === undefined) {
      next();
      return;
    }
    const user = await findActiveUser(userId);
    if (user) {
      res.locals.user = user;
      next();
      return;
    }
    req.session.destroy((err) => next(err));
  };
}

/** 401 unless signed in. */
export const requireUser: RequestHandler = (_req, res, next) => {
  next(res.locals.user ? undefined : unauthenticated());
};

/** 401 unless signed in, 403 unless the role is at least `minimum`. */
export function requireRole(minimum: Role): RequestHandler {
  return (_req, res, next) => {
    const user = res.locals.user;
    if (!user) next(unauthenticated());
    else if (!hasRole(user.role, minimum)) next(forbidden());
    else next();
  };
}

/** The signed-in user of a request that passed requireUser/requireRole. */
export function currentUser(locals: Express.Locals): SessionUser {
  if (!locals.user) throw unauthenticated();
  return locals.user;
}
