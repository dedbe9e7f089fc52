import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signInFailedMessage } from '../../shared/schemas/auth.js';
import { agentWithCsrf, DEMO_PASSWORD, signIn, startTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ SIGN_IN_ATTEMPTS: '5' });
});
afterAll(() => t.close());

const cookieOf = (res: request.Response) => ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('skewbench.sid='));

describe('POST /api/auth/sign-in', () => {
  it('signs a demo account in: 200 with the user, an httpOnly SameSite=Lax cookie, and /me works', async () => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'Researcher@Lab.test', password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: 'researcher@lab.test', role: 'researcher' });
    const cookie = cookieOf(res)!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const me = await agent.get('/api/auth/me').expect(200);
    expect(Object.keys(me.body.user).sort()).toEqual(['email', 'id', 'name', 'role']);
  });

  it('gives the session a new id at sign-in (no session fixation)', async () => {
    const agent = request.agent(t.app);
    const before = await agent.get('/api/auth/csrf');
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', before.body.token).send({ email: 'visitor@lab.test', password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(cookieOf(res)!.split(';')[0]).not.toBe(cookieOf(before)!.split(';')[0]);
  });

  it('answers an unknown e-mail and a wrong password with the same 401 and message', async () => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    const unknown = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'nobody@lab.test', password: DEMO_PASSWORD });
    const wrong = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'manager@lab.test', password: 'not-the-password' });
    expect(unknown.status).toBe(401);
    expect(wrong.status).toBe(401);
    expect(unknown.body).toEqual(wrong.body);
    expect(wrong.body).toEqual({ error: { code: 'invalid_credentials', message: signInFailedMessage } });
    await agent.get('/api/auth/me').expect(401);
  });

  it('limits failed attempts: after 5 failures for one e-mail the next answer is 429', async () => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    const attempt = () => agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'researcher2@lab.test', password: 'guess-guess' });
    for (let i = 0; i < 5; i++) expect((await attempt()).status).toBe(401);
    const limited = await attempt();
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('rate_limited');
    // Even the right password waits out the window.
    const right = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'researcher2@lab.test', password: DEMO_PASSWORD });
    expect(right.status).toBe(429);
  });

  it('answers bad input with 400 and the field paths', async () => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: '', password: 42 });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'password']);
  });

  it('answers malformed JSON with 400 invalid_json, not a 500', async () => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).set('content-type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_json');
  });

  it('answers an oversized body with 413', async () => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'a@b.c', password: 'x'.repeat(2_000_000) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
  });
});

describe('CSRF', () => {
  it('refuses a state-changing request without the token with 403 csrf_invalid', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').send({ email: 'manager@lab.test', password: DEMO_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
    expect(typeof res.body.error.message).toBe('string');
  });

  it('refuses a wrong token, and a token of another session', async () => {
    const { agent } = await agentWithCsrf(t.app);
    const other = await agentWithCsrf(t.app);
    for (const token of ['wrong', other.csrf]) {
      const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', token).send({ email: 'manager@lab.test', password: DEMO_PASSWORD });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('csrf_invalid');
    }
  });

  it('renews the token at sign-in, so a token from before sign-in no longer works', async () => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'manager@lab.test', password: DEMO_PASSWORD }).expect(200);
    const res = await agent.post('/api/auth/sign-out').set('x-csrf-token', csrf);
    expect(res.status).toBe(403);
  });
});

describe('signed out', () => {
  it('answers 401 with the error shape on /me and on the people routes', async () => {
    for (const path of ['/api/auth/me', '/api/users']) {
      const res = await request(t.app).get(path);
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('unauthenticated');
    }
  });

  it('sign-out ends the session', async () => {
    const { agent, csrf } = await signIn(t.app, 'researcher@lab.test');
    await agent.post('/api/auth/sign-out').set('x-csrf-token', csrf).expect(204);
    await agent.get('/api/auth/me').expect(401);
  });

  it('unknown API routes answer a JSON 404', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('security headers', () => {
  it('sends a Content-Security-Policy without inline scripts and nosniff', async () => {
    const res = await request(t.app).get('/api/health');
    const directives = String(res.headers['content-security-policy']).split(';').map((d) => d.trim());
    expect(directives).toContain("script-src 'self'");
    expect(directives).toContain("default-src 'self'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
  });
});
