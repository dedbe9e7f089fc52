import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentWithCsrf, signIn, startTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(() => t.close());

const row = async (email: string) =>
  (await t.db.sequelize.query<{ id: number; role: string; active: boolean; password_hash: string; name: string }>(
    'SELECT id, role, active, password_hash, name FROM users WHERE email = :email',
    { replacements: { email }, type: QueryTypes.SELECT },
  ))[0];

describe('people routes: role guards', () => {
  it.each([
    ['visitor@lab.test', 403],
    ['researcher@lab.test', 403],
    ['manager@lab.test', 200],
  ])('GET /api/users as %s → %i', async (email, status) => {
    const { agent } = await signIn(t.app, email);
    const res = await agent.get('/api/users');
    expect(res.status).toBe(status);
    if (status === 403) expect(res.body.error.code).toBe('forbidden');
    else expect(res.body.users.map((u: { email: string }) => u.email)).toContain('visitor@lab.test');
  });

  it('a researcher can neither create nor change accounts', async () => {
    const { agent, csrf } = await signIn(t.app, 'researcher@lab.test');
    const me = await row('researcher@lab.test');
    expect((await agent.post('/api/users').set('x-csrf-token', csrf).send({})).status).toBe(403);
    expect((await agent.patch(`/api/users/${me.id}`).set('x-csrf-token', csrf).send({ role: 'manager' })).status).toBe(403);
    expect((await row('researcher@lab.test')).role).toBe('researcher');
  });
});

describe('POST /api/users', () => {
  it('creates an account with a bcrypt cost-12 hash, and the new person can sign in', async () => {
    const { agent, csrf } = await signIn(t.app, 'manager@lab.test');
    const res = await agent
      .post('/api/users')
      .set('x-csrf-token', csrf)
      .send({ email: 'Noor.Fenwick@lab.test', name: 'Noor Fenwick', role: 'researcher', password: 'first-password-1' });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'noor.fenwick@lab.test', role: 'researcher', active: true });
    expect(res.body.user).not.toHaveProperty('passwordHash');
    const stored = await row('noor.fenwick@lab.test');
    expect(stored.password_hash).toMatch(/^\$2[aby]\$12\$/);
    await signIn(t.app, 'noor.fenwick@lab.test', 'first-password-1');
  });

  it('refuses a duplicate e-mail with 409 email_taken on the email field', async () => {
    const { agent, csrf } = await signIn(t.app, 'manager@lab.test');
    const res = await agent
      .post('/api/users')
      .set('x-csrf-token', csrf)
      .send({ email: 'VISITOR@lab.test', name: 'Copy', role: 'visitor', password: 'another-password' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('email_taken');
    expect(res.body.error.details).toEqual([{ path: 'email', message: expect.any(String) }]);
  });

  it('refuses bad fields with 400 and every field path, and stores nothing', async () => {
    const { agent, csrf } = await signIn(t.app, 'manager@lab.test');
    const res = await agent.post('/api/users').set('x-csrf-token', csrf).send({ email: 'nope', name: '', role: 'boss', password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'name', 'password', 'role']);
    expect(await row('nope')).toBeUndefined();
  });
});

describe('PATCH /api/users/:id', () => {
  it('changes a role, and the change applies to the open session at once', async () => {
    const manager = await signIn(t.app, 'manager@lab.test');
    const person = await signIn(t.app, 'researcher2@lab.test');
    await person.agent.get('/api/users').expect(403);
    const target = await row('researcher2@lab.test');
    const res = await manager.agent.patch(`/api/users/${target.id}`).set('x-csrf-token', manager.csrf).send({ role: 'manager' });
    expect(res.status).toBe(200);
    expect(res.body.user.role).toBe('manager');
    await person.agent.get('/api/users').expect(200);
    await manager.agent.patch(`/api/users/${target.id}`).set('x-csrf-token', manager.csrf).send({ role: 'researcher' }).expect(200);
  });

  it('deactivation ends the person’s open sessions at once and blocks sign-in', async () => {
    const manager = await signIn(t.app, 'manager@lab.test');
    const { agent } = await signIn(t.app, 'visitor@lab.test');
    await agent.get('/api/auth/me').expect(200);
    const target = await row('visitor@lab.test');
    await manager.agent.patch(`/api/users/${target.id}`).set('x-csrf-token', manager.csrf).send({ active: false }).expect(200);

    expect((await agent.get('/api/auth/me')).status).toBe(401);
    const left = await t.db.sequelize.query(`SELECT sid FROM sessions WHERE sess ->> 'userId' = :id`, {
      replacements: { id: String(target.id) },
      type: QueryTypes.SELECT,
    });
    expect(left).toHaveLength(0);
    const { agent: again, csrf } = await agentWithCsrf(t.app);
    const denied = await again.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'visitor@lab.test', password: 'skewbench-demo' });
    expect(denied.status).toBe(401);
    expect(denied.body.error.code).toBe('invalid_credentials');

    await manager.agent.patch(`/api/users/${target.id}`).set('x-csrf-token', manager.csrf).send({ active: true }).expect(200);
    await signIn(t.app, 'visitor@lab.test');
  });

  it('keeps at least one active manager: the only manager cannot demote or deactivate themselves', async () => {
    const manager = await signIn(t.app, 'manager@lab.test');
    const res = await manager.agent.patch(`/api/users/${manager.user.id}`).set('x-csrf-token', manager.csrf).send({ active: false });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('last_manager');
    expect((await row('manager@lab.test')).active).toBe(true);
  });

  it('answers 404 for an unknown id and 400 for a malformed one or an unknown field', async () => {
    const { agent, csrf } = await signIn(t.app, 'manager@lab.test');
    const missing = await agent.patch('/api/users/999999').set('x-csrf-token', csrf).send({ name: 'X' });
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('not_found');
    const malformed = await agent.patch('/api/users/abc').set('x-csrf-token', csrf).send({ name: 'X' });
    expect(malformed.status).toBe(400);
    expect(malformed.body.error.details[0].path).toBe('params.id');
    const unknown = await agent.patch('/api/users/1').set('x-csrf-token', csrf).send({ password: 'x' });
    expect(unknown.status).toBe(400);
  });
});

describe('GET /api/lab', () => {
  it('tells anyone the lab name and time zone, and that mail goes to the local capture', async () => {
    const res = await request(t.app).get('/api/lab').expect(200);
    expect(res.body).toEqual({
      name: t.config.lab.name,
      timeZone: t.config.lab.timeZone,
      publicUrl: t.config.publicUrl,
      mail: { captureInUse: true, from: t.config.mail.from },
    });
  });

  it('says the local capture is not in use when SMTP_URL names the lab relay', async () => {
    const relay = await startTestApp({ SMTP_URL: 'smtp://relay.lab.test:25', MAIL_FROM: 'Bench <bench@lab.test>' });
    try {
      const res = await request(relay.app).get('/api/lab').expect(200);
      expect(res.body.mail).toEqual({ captureInUse: false, from: 'Bench <bench@lab.test>' });
    } finally {
      await relay.close();
    }
  });
});
