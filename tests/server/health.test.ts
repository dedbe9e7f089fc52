// The health check and the 503 answers while PostgreSQL is down. This file runs its own cluster,
// because it stops and restarts it; the other files keep the shared test cluster.
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Cluster, freePort } from '../../scripts/lib/postgres.mjs';
import { createApp } from '../../server/app.js';
import { connectDatabase } from '../../server/db/connect.js';
import { migrate } from '../../server/db/migrator.js';
import { createUser } from '../../server/features/people/people.service.js';
import { loadConfig } from '../../server/config.js';
import { signIn } from '../support/test-app.js';

let temp: string;
let cluster: Cluster;
let db: ReturnType<typeof connectDatabase>;
let app: ReturnType<typeof createApp>;

beforeAll(async () => {
  temp = mkdtempSync(path.join(os.tmpdir(), 'skewbench-health-'));
  cluster = new Cluster({ base: path.join(temp, 'pg'), port: await freePort(), password: 'health-test-pw', throwaway: true });
  cluster.init();
  cluster.start();
  await cluster.createDatabase('health');
  const c = cluster.connection('health');
  const config = loadConfig({
    NODE_ENV: 'test', LOG_LEVEL: 'silent', SESSION_SECRET: 'health-test-session-secret',
    PGHOST: c.host, PGPORT: String(c.port), PGUSER: c.user, PGPASSWORD: c.password, PGDATABASE: c.database,
  });
  db = connectDatabase(config);
  await migrate(db.sequelize);
  await createUser({ email: 'bench@lab.test', name: 'Bench Tester', role: 'researcher', password: 'health-password' });
  app = createApp({ config, sequelize: db.sequelize, sessionPool: db.sessionPool });
}, 120_000);

afterAll(async () => {
  await db?.close();
  cluster?.stop();
  rmSync(temp, { recursive: true, force: true });
});

describe('GET /api/health across a database outage', () => {
  it('is 200 ok, 503 with db down while PostgreSQL is stopped, and 200 again after it restarts without an app restart', async () => {
    const { agent } = await signIn(app, 'bench@lab.test', 'health-password');
    expect((await request(app).get('/api/health')).body).toEqual({ status: 'ok', db: 'ok' });

    cluster.stop();
    const down = await request(app).get('/api/health');
    expect(down.status).toBe(503);
    expect(down.body.db).toBe('down');
    expect(down.body.error.code).toBe('db_unavailable');

    // A signed-in request needs the session store: a clear 503, not a 500 or a hang.
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(503);
    expect(me.body.error.code).toBe('db_unavailable');

    cluster.start();
    let up = await request(app).get('/api/health');
    for (let i = 0; i < 20 && up.status !== 200; i++) {
      await new Promise((r) => setTimeout(r, 250));
      up = await request(app).get('/api/health');
    }
    expect(up.status).toBe(200);
    expect(up.body).toEqual({ status: 'ok', db: 'ok' });
    // The session was kept in PostgreSQL, so it is still valid.
    expect((await agent.get('/api/auth/me')).status).toBe(200);
  }, 90_000);
});
