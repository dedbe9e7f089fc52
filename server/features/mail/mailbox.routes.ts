import { Router, type RequestHandler } from 'express';
import { idParamsSchema } from '../../../shared/schemas/people.js';
import { attachmentParamsSchema, mailboxQuerySchema, outboxQuerySchema } from '../../../shared/schemas/mail.js';
import { requireRole } from '../../lib/auth.js';
import { AppError } from '../../lib/errors.js';
import { validate } from '../../lib/validate.js';
import * as mailbox from './mailbox.service.js';

/** The captured mail of the local SMTP server: /api/mailbox, managers only, only while SMTP_URL is unset. */
export function mailboxRouter(options: { captureInUse: boolean }): Router {
  const router = Router();
  router.use(requireRole('manager'));
  const captureOnly: RequestHandler = (_req, _res, next) => {
    next(
      options.captureInUse
        ? undefined
        : new AppError(404, 'mail_capture_off', "Mail goes to the lab's relay (SMTP_URL is set), so there is no local mailbox to show."),
    );
  };
  router.use(captureOnly);

  router.get('/', validate({ query: mailboxQuerySchema }), async (_req, res) => {
    res.json(await mailbox.listCaptured(res.locals.query));
  });
  router.delete('/', async (_req, res) => {
    res.json({ deleted: await mailbox.clearCaptured() });
  });
  router.get('/:id', validate({ params: idParamsSchema }), async (_req, res) => {
    res.json({ message: await mailbox.getCaptured(res.locals.params.id) });
  });
  // The HTML part as its own document for the preview frame, locked down: no scripts, no requests out.
  router.get('/:id/html', validate({ params: idParamsSchema }), async (_req, res) => {
    const message = await mailbox.getCaptured(res.locals.params.id);
    res.set('Content-Security-Policy', "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'self'; sandbox");
    res.set('X-Frame-Options', 'SAMEORIGIN');
    res.type('html').send(message.html ?? '<p>This message has no HTML part.</p>');
  });
  router.get('/:id/attachments/:index', validate({ params: attachmentParamsSchema }), async (_req, res) => {
    const a = await mailbox.capturedAttachment(res.locals.params.id, res.locals.params.index);
    res.attachment(a.filename).type(a.contentType).send(a.content);
  });
  return router;
}

/** The outgoing queue: /api/outbox, managers only (whichever way mail is sent). */
export function outboxRouter(): Router {
  const router = Router();
  router.use(requireRole('manager'));
  router.get('/', validate({ query: outboxQuerySchema }), async (_req, res) => {
    res.json(await mailbox.listOutbox(res.locals.query));
  });
  // A message refused for good (e.g. an unknown mailbox at the relay) goes back in the queue once fixed.
  router.post('/retry', async (_req, res) => {
    res.json({ requeued: await mailbox.retryFailed(null) });
  });
  router.post('/:id/retry', validate({ params: idParamsSchema }), async (_req, res) => {
    res.json({ requeued: await mailbox.retryFailed(res.locals.params.id) });
  });
  return router;
}
