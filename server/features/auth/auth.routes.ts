import { Router, type Request } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import {
  forgotPasswordAnswer,
  forgotPasswordInputSchema,
  setPasswordInputSchema,
  signInFailedMessage,
  signInInputSchema,
  tokenParamsSchema,
} from '../../../shared/schemas/auth.js';
import { notificationSettingsSchema } from '../../../shared/schemas/mail.js';
import { currentUser, requireUser } from '../../lib/auth.js';
import { csrfTokenFor } from '../../lib/csrf.js';
import { AppError } from '../../lib/errors.js';
import { validate } from '../../lib/validate.js';
import type { AccountMailLab } from '../mail/templates/account-mail.js';
import { acceptInvitation, getInvitation } from '../people/invitations.service.js';
import { getNotificationPreferences, updateNotificationPreferences } from '../people/notification-settings.service.js';
import { getResetLink, requestPasswordReset, resetPassword } from '../people/password-reset.service.js';
import { authenticate } from '../people/people.service.js';

function regenerate(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));
}

function save(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.save((err) => (err ? reject(err) : resolve())));
}

function destroy(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
}

/** A new session for `userId`, as at sign-in: a new id (against fixation) and a new CSRF token. */
async function startSession(req: Request, userId: number): Promise<void> {
  await regenerate(req);
  req.session.userId = userId;
  csrfTokenFor(req);
  await save(req);
}

/**
 * Sign-in, sign-out, the current user and the CSRF token, invitation and password-reset links, and the
 * person's notification choices: /api/auth.
 */
export function authRouter(options: { signInAttempts: number; lab: AccountMailLab }): Router {
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

  // Every request counts (all answer alike), per client address and e-mail, so nobody floods a mailbox.
  const forgotPasswordLimiter = rateLimit({
    windowMs: 15 * 60 * 1000,
    limit: options.signInAttempts,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => {
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
      return `${ipKeyGenerator(req.ip ?? '')}|${email}`;
    },
    handler: (_req, _res, next) => {
      next(new AppError(429, 'rate_limited', 'Too many password reset requests. Wait 15 minutes and try again.'));
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
    await startSession(req, user.id);
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

  router.get('/me/notifications', requireUser, async (_req, res) => {
    res.json(await getNotificationPreferences(currentUser(res.locals).id));
  });

  router.put('/me/notifications', requireUser, validate({ body: notificationSettingsSchema }), async (_req, res) => {
    res.json(await updateNotificationPreferences(currentUser(res.locals).id, res.locals.body));
  });

  router.get('/invitation/:token', validate({ params: tokenParamsSchema }), async (_req, res) => {
    res.json(await getInvitation(res.locals.params.token, options.lab.name));
  });

  // Accepting sets the password and signs the person in, like a sign-in.
  router.post('/invitation/:token', validate({ params: tokenParamsSchema, body: setPasswordInputSchema }), async (req, res) => {
    const user = await acceptInvitation(res.locals.params.token, res.locals.body.password);
    await startSession(req, user.id);
    res.json({ user });
  });

  // 202 with the same body whether or not the address has an account.
  router.post('/forgot-password', forgotPasswordLimiter, validate({ body: forgotPasswordInputSchema }), async (_req, res) => {
    await requestPasswordReset(res.locals.body.email, options.lab);
    res.status(202).json(forgotPasswordAnswer);
  });

  router.get('/reset-password/:token', validate({ params: tokenParamsSchema }), async (_req, res) => {
    res.json(await getResetLink(res.locals.params.token));
  });

  // Every session of the person ends, this one too if it is theirs: they sign in with the new password.
  router.post('/reset-password/:token', validate({ params: tokenParamsSchema, body: setPasswordInputSchema }), async (req, res) => {
    const userId = await resetPassword(res.locals.params.token, res.locals.body.password);
    if (req.session.userId === userId) {
      await destroy(req);
      res.clearCookie('skewbench.sid', { path: '/' });
    }
    res.json({ message: 'Your password was changed and you were signed out everywhere. Sign in with the new password.' });
  });

  return router;
}
