import { randomBytes } from 'node:crypto';
import pg from 'pg';
import request from 'supertest';
import type { Express } from 'express';
import { createApp } from '../../server/app.js';
import { connectDatabase } from '../../server/db/connect.js';
import type { Config } from '../../server/config.js';
import { startMail, type MailRuntime } from '../../server/features/mail/mail.runtime.js';
import { TEMPLATE_DB, testCluster, testConfig } from './test-env.js';

export const DEMO_PASSWORD = 'skewbench-demo';

/** A fresh database cloned from the migrated, seeded template; returns its name. */
export async function createTestDatabase(): Promise<string> {
  const name = `t_${randomBytes(6).toString('hex')}`;
  const admin = new pg.Client({ ...testCluster(), database: 'postgres' });
  await admin.connect();
  try {
    // Cloning fails while another session touches the template; that only lasts a moment.
    for (let attempt = 0; ; attempt++) {
      try {
        await admin.query(`CREATE DATABASE ${name} TEMPLATE ${TEMPLATE_DB}`);
        return name;
      } catch (err) {
        if (attempt >= 20 || !/being accessed by other users/.test(String(err))) throw err;
        await new Promise((r) => setTimeout(r, 100));
      }
    }
  } finally {
    await admin.end();
  }
}

export interface TestApp {
  app: Express;
  config: Config;
  db: ReturnType<typeof connectDatabase>;
  /** The outbox worker and the local SMTP capture (or SMTP_URL's transport), when asked for with `mail: true`. */
  mail: MailRuntime | null;
  close(): Promise<void>;
}

/**
 * The real app on its own database in the test cluster. With `mail: true` the process's mail runs as in
 * `npm start`: the local capture server on a free port (unless SMTP_URL is given) and the outbox worker.
 */
export async function startTestApp(overrides: Record<string, string> = {}, options: { mail?: boolean; mailPollMs?: number } = {}): Promise<TestApp> {
  const database = await createTestDatabase();
  const config = testConfig(database, overrides);
  const db = connectDatabase(config);
  const app = createApp({ config, sequelize: db.sequelize, sessionPool: db.sessionPool });
  const mail = options.mail ? await startMail(db.sequelize, config.mail, config.publicUrl, { pollMs: options.mailPollMs ?? 250 }) : null;
  return {
    app,
    config,
    db,
    mail,
    close: async () => {
      await mail?.stop();
      await db.close();
    },
  };
}

/** A supertest agent (keeps cookies) with the session's CSRF token. */
export async function agentWithCsrf(target: Express | string) {
  const agent = request.agent(target);
  const res = await agent.get('/api/auth/csrf').expect(200);
  return { agent, csrf: res.body.token as string };
}

/** A supertest agent signed in as `email`, with a fresh CSRF token for writes. */
export async function signIn(target: Express | string, email: string, password = DEMO_PASSWORD) {
  const { agent, csrf } = await agentWithCsrf(target);
  const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  const fresh = await agent.get('/api/auth/csrf').expect(200);
  return { agent, csrf: fresh.body.token as string, user: res.body.user as { id: number; role: string } };
}
