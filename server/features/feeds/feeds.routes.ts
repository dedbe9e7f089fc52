import { Router } from 'express';
import {
  createFeedInputSchema,
  feedTokenParamsSchema,
  instrumentFeedParamsSchema,
  personFeedParamsSchema,
} from '../../../shared/schemas/feeds.js';
import { currentUser, requireUser } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import * as feeds from './feeds.service.js';

/** iCalendar feeds at secret-token URLs: /api/feeds. Everyone signed in manages their own. */
export function feedsRouter(site: feeds.FeedSite): Router {
  const router = Router();

  // Calendar apps fetch without cookies, so the token in the path is the only credential: this route comes
  // before requireUser. A GET passes the CSRF check, and the session middleware only reads a cookie if one is sent.
  router.get('/:token.ics', validate({ params: feedTokenParamsSchema }), async (_req, res) => {
    const body = await feeds.renderFeed(res.locals.params.token, site);
    // Only the token holder may see it, so shared caches must not keep it.
    res.set('Cache-Control', 'private, max-age=300').type('text/calendar; charset=utf-8').send(body);
  });

  router.use(requireUser);

  router.get('/', async (_req, res) => {
    res.json({ feeds: await feeds.listFeeds(currentUser(res.locals).id) });
  });

  router.post('/', validate({ body: createFeedInputSchema }), async (_req, res) => {
    res.status(201).json({ feed: await feeds.createFeed(currentUser(res.locals).id, res.locals.body, site) });
  });

  router.delete('/instrument/:instrumentId', validate({ params: instrumentFeedParamsSchema }), async (_req, res) => {
    await feeds.revokeFeed(currentUser(res.locals).id, 'instrument', res.locals.params.instrumentId);
    res.status(204).end();
  });

  router.delete('/:scope', validate({ params: personFeedParamsSchema }), async (_req, res) => {
    await feeds.revokeFeed(currentUser(res.locals).id, 'person', null);
    res.status(204).end();
  });

  return router;
}
