import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { AppError } from './errors.js';

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

/** The session's CSRF token, created on first use. */
export function csrfTokenFor(req: Request): string {
  if (!req.session.csrfToken) req.session.csrfToken = randomBytes(32).toString('base64url');
  return req.session.csrfToken;
}

/** Synchronizer-token check: every state-changing request carries the session's token in `x-csrf-token`. */
export const requireCsrfToken: RequestHandler = (req, _res, next) => {
  if (safeMethods.has(req.method)) {
    next();
    return;
  }
  const expected = req.session?.csrfToken;
  const given = req.get('x-csrf-token');
  let ok = false;
  if (typeof expected === 'string' && typeof given === 'string') {
    const a = Buffer.from(given);
    const b = Buffer.from(expected);
    ok = a.length === b.length && timingSafeEqual(a, b);
  }
  next(ok ? undefined : new AppError(403, 'csrf_invalid', 'The form has expired or the request was not sent by Skewbench. Reload the page and try again.'));
};
