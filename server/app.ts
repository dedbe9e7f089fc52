import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import connectPgSimple from 'connect-pg-simple';
import express, { type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import type pg from 'pg';
import type { Sequelize } from 'sequelize';
import type { Config } from './config.js';
import { analysisRouter } from './features/analysis/analysis.routes.js';
import { authRouter } from './features/auth/auth.routes.js';
import { feedsRouter } from './features/feeds/feeds.routes.js';
import { mailboxRouter, outboxRouter } from './features/mail/mailbox.routes.js';
import { bookingsRouter } from './features/bookings/bookings.routes.js';
import { instrumentsRouter } from './features/instruments/instruments.routes.js';
import { labRouter } from './features/lab/lab.routes.js';
import { findActiveUser } from './features/people/people.service.js';
import { peopleRouter } from './features/people/people.routes.js';
import { photosRouter } from './features/photos/photos.routes.js';
import { partsRouter } from './features/parts/parts.routes.js';
import { setupsRouter } from './features/setups/setups.routes.js';
import { solverRouter } from './features/solver/solver.routes.js';
import { loadSessionUser } from './lib/auth.js';
import { requireCsrfToken } from './lib/csrf.js';
import { apiNotFound, errorHandler } from './lib/error-handler.js';

export interface AppDeps {
  config: Config;
  sequelize: Sequelize;
  /** node-postgres pool of the session store. */
  sessionPool: pg.Pool;
}

export const SESSION_COOKIE = 'skewbench.sid';

/** Build the Express app (API and, when built, the client). Listening is the caller's business. */
export function createApp({ config, sequelize, sessionPool }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  if (config.trustProxy) app.set('trust proxy', config.trustProxy);

  const https = config.publicUrl.startsWith('https://');
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          'default-src': ["'self'"],
          'script-src': ["'self'"],
          // FullCalendar and React inline style attributes; no inline scripts anywhere.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          // FullCalendar's icon font ships inside its stylesheet as a data: URL.
          'font-src': ["'self'", 'data:'],
          'connect-src': ["'self'"],
          'object-src': ["'none'"],
          'base-uri': ["'self'"],
          'form-action': ["'self'"],
          'frame-ancestors': ["'none'"],
          ...(https ? { 'upgrade-insecure-requests': [] } : {}),
        },
      },
      strictTransportSecurity: https,
    }),
  );

  app.use((_req, res, next) => {
    res.locals.requestId = randomUUID();
    next();
  });

  // Health answers without a session, so it works while the session store is down.
  app.get('/api/health', async (_req, res) => {
    try {
      await sequelize.query('SELECT 1');
      res.json({ status: 'ok', db: 'ok' });
    } catch {
      res.status(503).json({
        status: 'unavailable',
        db: 'down',
        error: { code: 'db_unavailable', message: 'The database is not reachable right now.' },
      });
    }
  });

  const PgStore = connectPgSimple(session);
  app.use(
    '/api',
    express.json({ limit: '1mb' }),
    session({
      name: SESSION_COOKIE,
      secret: config.sessionSecret,
      // A session lasts 12 h from sign-in, not 12 h from the last request: without touch (and so without
      // rolling, which would only renew the cookie) a request reads its session row and never writes it, one
      // UPDATE per API call fewer. The user row is still read on every request, so deactivation is immediate.
      store: new PgStore({ pool: sessionPool, tableName: 'sessions', pruneSessionInterval: 15 * 60, disableTouch: true }),
      resave: false,
      saveUninitialized: false,
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: config.env === 'production' ? 'auto' : false,
        maxAge: 12 * 60 * 60 * 1000,
      },
    }),
    loadSessionUser(findActiveUser),
    requireCsrfToken,
  );

  const accountMailLab = { name: config.lab.name, timeZone: config.lab.timeZone, publicUrl: config.publicUrl };
  app.use('/api/auth', authRouter({ signInAttempts: config.signInAttempts, lab: accountMailLab }));
  app.use('/api/users', peopleRouter({ lab: accountMailLab }));
  app.use('/api/lab', labRouter({ ...config.lab, publicUrl: config.publicUrl, mail: { captureInUse: config.mail.captureInUse, from: config.mail.from } }));
  app.use('/api/instruments', instrumentsRouter({ timeZone: config.lab.timeZone }));
  app.use('/api/parts', partsRouter());
  app.use('/api/analysis', analysisRouter());
  app.use('/api/setups', setupsRouter());
  app.use('/api/solver', solverRouter());
  const booking = bookingsRouter({ timeZone: config.lab.timeZone, lab: { name: config.lab.name, publicUrl: config.publicUrl } });
  app.use('/api/bookings', booking.bookings);
  app.use('/api/waitlist', booking.waitlist);
  app.use('/api/photos', photosRouter(config.uploads));
  app.use('/api/feeds', feedsRouter({ publicUrl: config.publicUrl, labName: config.lab.name }));
  app.use('/api/mailbox', mailboxRouter({ captureInUse: config.mail.captureInUse }));
  app.use('/api/outbox', outboxRouter());
  app.use('/api', apiNotFound);

  // The built client: hashed assets cached for long, index.html never, every other path is the SPA.
  const dist = path.resolve(config.clientDist);
  if (existsSync(path.join(dist, 'index.html'))) {
    app.use('/assets', express.static(path.join(dist, 'assets'), { immutable: true, maxAge: '1y', fallthrough: false }));
    app.use(express.static(dist, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(path.join(dist, 'index.html'));
    });
  }

  app.use(errorHandler);
  return app;
}
