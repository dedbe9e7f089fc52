// A session lives in PostgreSQL, so it survives a restart of the API process.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort } from '../../scripts/lib/postgres.mjs';
import { createTestDatabase, DEMO_PASSWORD } from '../support/test-app.js';
import { testCluster } from '../support/test-env.js';

const root = path.resolve(import.meta.dirname, '..', '..');
let env: NodeJS.ProcessEnv;
let server: ChildProcess | undefined;

/** Start the real server entry point (tsx server/index.ts) and wait until it listens. */
function startServer(): Promise<ChildProcess> {
  return new Promise((resolve, reject) => {
    const child = spawn(path.join(root, 'node_modules', '.bin', 'tsx'), ['server/index.ts'], { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    const timer = setTimeout(() => reject(new Error(`server did not start:\n${output}`)), 30_000);
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      if (output.includes('Skewbench is running at')) {
        clearTimeout(timer);
        resolve(child);
      }
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', onData);
    child.on('exit', (code) => reject(new Error(`server exited with ${code}:\n${output}`)));
  });
}

function stopServer(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    child.once('exit', () => resolve());
    child.kill('SIGTERM');
  });
}

beforeAll(async () => {
  const c = testCluster();
  const port = await freePort();
  env = {
    ...process.env,
    NODE_ENV: 'test', LOG_LEVEL: 'warn', HOST: '127.0.0.1', PORT: String(port),
    PGHOST: c.host, PGPORT: String(c.port), PGUSER: c.user, PGPASSWORD: c.password, PGDATABASE: await createTestDatabase(),
    SESSION_SECRET: 'restart-test-session-secret',
    SMTP_CAPTURE_PORT: '0',
  };
});

afterAll(async () => {
  if (server && server.exitCode === null) await stopServer(server);
});

describe('API restart', () => {
  it('keeps a signed-in session valid across a stop and start of the server process', async () => {
    const url = `http://127.0.0.1:${env.PORT}`;
    server = await startServer();
    const agent = request.agent(url);
    const csrf = (await agent.get('/api/auth/csrf').expect(200)).body.token;
    await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'researcher@lab.test', password: DEMO_PASSWORD }).expect(200);

    await stopServer(server);
    server = await startServer();

    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('researcher@lab.test');
  }, 90_000);
});
