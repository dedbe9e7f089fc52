import { Router, type Request } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import { signInFailedMessage, signInInputSchema } from '../../../shared/schemas/auth.js';
import { requireUser } from '../../lib/auth.js';
import { csrfTokenFor } from '../../lib/csrf.js';
import { AppError } from '../../lib/errors.js';
import { validate } from '../../lib/validate.js';
import { authenticate } from '../people/people.service.js';

function regenerate(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));
}

function save(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.save((err) => (err ? reject(err) : resolve())));
}

/** Sign-in, sign-out, the current user and the CSRF token: /api/auth. */
export function authRouter(options: { signInAttempts: number }): Router {
  const router = Router();

  // Failed attempts per client address and e-mail; successful sign-ins do not count.
  const signInLimiter = rateLimit({
    windowMs: 15 * 60 * 1000,
    limit: options.signInAttempts,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => {
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
      return `${ipKeyGenerator(req.ip ?? '')}|${email}`;
    },
    handler: (_req, _res, next) => {
      next(new AppError(429, 'rate_limited', 'Too many failed sign-in attempts. Wait 15 minutes and try again.'));
    },
  });

  router.get('/csrf', (req, res) => {
    res.json({ token: csrfTokenFor(req) });
  });

  router.post('/sign-in', signInLimiter, validate({ body: signInInputSchema }), async (req, res) => {
    const { email, password } = res.locals.body;
    const user = await authenticate(email, password);
    if (!user) throw new AppError(401, 'invalid_credentials', signInFailedMessage);
    // A new session id at sign-in defeats session fixation; the CSRF token is renewed with it.
    await regenerate(req);
    req.session.userId = user.id;
    csrfTokenFor(req);
    await save(req);
    res.json({ user });
  });

  router.post('/sign-out', (req, res, next) => {
    req.session.destroy((err) => {
      if (err) {
        next(err);
        return;
      }
      res.clearCookie('skewbench.sid', { path: '/' });
      res.status(204).end();
    });
  });

  router.get('/me', requireUser, (_req, res) => {
    res.json({ user: res.locals.user });
  });

  return router;
}
