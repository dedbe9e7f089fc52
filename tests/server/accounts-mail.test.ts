// Invitations, password resets and notification choices: the links reach the local SMTP capture, work once,
// expire, and give nothing away about which addresses have accounts.
import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { forgotPasswordAnswer } from '../../shared/schemas/auth.js';
import { enqueueForUser } from '../../server/features/mail/outbox.service.js';
import { agentWithCsrf, DEMO_PASSWORD, signIn, startTestApp, type TestApp } from '../support/test-app.js';

const PUBLIC_URL = 'https://bench.kestrel.test';
const HOUR = 60 * 60 * 1000;

let t: TestApp;
let manager: Awaited<ReturnType<typeof signIn>>;
let managerName: string;
beforeAll(async () => {
  t = await startTestApp({ PUBLIC_URL, SIGN_IN_ATTEMPTS: '5' }, { mail: true });
  manager = await signIn(t.app, 'manager@lab.test');
  managerName = (await query<{ name: string }>(`SELECT name FROM users WHERE email = 'manager@lab.test'`))[0]!.name;
});
afterAll(() => t.close());

const query = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
  t.db.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
const sha256 = (value: string) => createHash('sha256').update(value).digest('hex');

interface Captured {
  id: number;
  to: string;
  toAddresses: string[];
  subject: string;
  text: string;
  html: string;
}

/** Deliver the outbox now and read the messages the local capture received for `address`, oldest first. */
async function mailTo(address: string): Promise<Captured[]> {
  await t.mail!.worker.kick();
  const list = await manager.agent.get('/api/mailbox').query({ to: address }).expect(200);
  const messages: Captured[] = [];
  for (const summary of [...list.body].reverse()) {
    const one = await manager.agent.get(`/api/mailbox/${summary.id}`).expect(200);
    messages.push({ ...summary, text: one.body.message.text, html: one.body.message.html });
  }
  return messages;
}

function linkToken(text: string, page: 'invitation' | 'reset-password'): string {
  const match = new RegExp(`${PUBLIC_URL.replace(/[.]/g, '\\.')}/${page}/([A-Za-z0-9_-]{43})(?![A-Za-z0-9_-])`).exec(text);
  if (!match) throw new Error(`no ${page} link in:\n${text}`);
  return match[1]!;
}

const outboxCount = async (address: string, kind: string) =>
  (await query<{ n: number }>('SELECT count(*)::int AS n FROM outbox WHERE to_address = :address AND kind = :kind', { address, kind }))[0]!.n;

async function invite(body: Record<string, unknown>) {
  return manager.agent.post('/api/users/invitations').set('x-csrf-token', manager.csrf).send(body);
}

describe('POST /api/users/invitations', () => {
  it('is for lab managers only', async () => {
    const researcher = await signIn(t.app, 'researcher@lab.test');
    const res = await researcher.agent.post('/api/users/invitations').set('x-csrf-token', researcher.csrf).send({ email: 'x@lab.test', name: 'X', role: 'visitor' });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
    expect(await query('SELECT id FROM users WHERE email = :e', { e: 'x@lab.test' })).toEqual([]);
  });

  it('creates the account without a password, stores only the hash of a 7-day token, and the invitation reaches the local SMTP server', async () => {
    const res = await invite({ email: 'Ilse.Marrow@lab.test', name: 'Ilse Marrow', role: 'researcher' });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'ilse.marrow@lab.test', name: 'Ilse Marrow', role: 'researcher', active: true, invited: true, lastSignInAt: null });
    expect(res.body.invitation.resent).toBe(false);
    expect(res.body.user.invitationExpiresAt).toBe(res.body.invitation.expiresAt);

    const [user] = await query<{ id: number; password_hash: string | null }>('SELECT id, password_hash FROM users WHERE email = :e', { e: 'ilse.marrow@lab.test' });
    expect(user!.password_hash).toBeNull();
    const tokens = await query<{ token_hash: string; purpose: string; expires_at: Date; created_at: Date; used_at: Date | null }>(
      'SELECT token_hash, purpose, expires_at, created_at, used_at FROM user_tokens WHERE user_id = :id',
      { id: user!.id },
    );
    expect(tokens).toHaveLength(1);
    expect(tokens[0]).toMatchObject({ purpose: 'invitation', used_at: null });
    expect(tokens[0]!.expires_at.getTime() - tokens[0]!.created_at.getTime()).toBeGreaterThan(7 * 24 * HOUR - 60_000);
    expect(tokens[0]!.expires_at.getTime() - tokens[0]!.created_at.getTime()).toBeLessThan(7 * 24 * HOUR + 60_000);

    const [message, ...more] = await mailTo('ilse.marrow@lab.test');
    expect(more).toEqual([]);
    expect(message!.toAddresses).toEqual(['ilse.marrow@lab.test']);
    expect(message!.subject).toBe(`${managerName} invited you to Skewbench at ${t.config.lab.name}`);
    const token = linkToken(message!.text, 'invitation');
    expect(message!.html).toContain(`${PUBLIC_URL}/invitation/${token}`);
    expect(tokens[0]!.token_hash).toBe(sha256(token));
    expect(tokens[0]!.token_hash).not.toContain(token);
    for (const words of [t.config.lab.name, 'Researcher', managerName, 'Link valid until', 'works once']) expect(message!.text).toContain(words);

    const list = await manager.agent.get('/api/users').expect(200);
    expect(list.body.users.find((u: { email: string }) => u.email === 'ilse.marrow@lab.test')).toMatchObject({ invited: true, invitationExpiresAt: res.body.invitation.expiresAt });
    expect(list.body.users.find((u: { email: string }) => u.email === 'visitor@lab.test')).toMatchObject({ invited: false, invitationExpiresAt: null });
  });

  it('refuses an address whose account has a password with 409 email_taken on the email field, and queues nothing', async () => {
    const before = await outboxCount('visitor@lab.test', 'invitation');
    const res = await invite({ email: 'VISITOR@lab.test', name: 'Someone', role: 'researcher' });
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({ code: 'email_taken', details: [{ path: 'email', message: expect.any(String) }] });
    expect(await outboxCount('visitor@lab.test', 'invitation')).toBe(before);
    expect((await query<{ role: string }>("SELECT role FROM users WHERE email = 'visitor@lab.test'"))[0]!.role).toBe('visitor');
  });

  it('refuses bad fields with 400 validation_failed naming each field', async () => {
    const res = await invite({ email: 'nope', name: '', role: 'boss' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'name', 'role']);
  });

  it('inviting a pending invitee again sends a new link, updates name and role, and the older link stops working', async () => {
    await invite({ email: 'pell.ardent@lab.test', name: 'Pell Ardent', role: 'visitor' });
    const first = linkToken((await mailTo('pell.ardent@lab.test'))[0]!.text, 'invitation');
    const again = await invite({ email: 'pell.ardent@lab.test', name: 'Pell Ardent-Vey', role: 'researcher' });
    expect(again.status).toBe(201);
    expect(again.body.invitation.resent).toBe(true);
    expect(again.body.user).toMatchObject({ name: 'Pell Ardent-Vey', role: 'researcher', invited: true });
    const messages = await mailTo('pell.ardent@lab.test');
    expect(messages).toHaveLength(2);
    const second = linkToken(messages[1]!.text, 'invitation');
    expect(second).not.toBe(first);
    expect(messages[1]!.text).toContain('older invitation links no longer work');

    const old = await request(t.app).get(`/api/auth/invitation/${first}`);
    expect(old.status).toBe(410);
    expect(old.body.error).toMatchObject({ code: 'token_invalid', details: { reason: 'expired' } });
    const fresh = await request(t.app).get(`/api/auth/invitation/${second}`).expect(200);
    expect(fresh.body).toMatchObject({ name: 'Pell Ardent-Vey', role: 'researcher' });
  });
});

describe('invitation links: /api/auth/invitation/:token', () => {
  it('shows who is invited, accepts a password once (signing the person in), and refuses reuse', async () => {
    await invite({ email: 'oren.sallow@lab.test', name: 'Oren Sallow', role: 'researcher' });
    const token = linkToken((await mailTo('oren.sallow@lab.test'))[0]!.text, 'invitation');

    const info = await request(t.app).get(`/api/auth/invitation/${token}`).expect(200);
    expect(info.body).toEqual({ email: 'oren.sallow@lab.test', name: 'Oren Sallow', role: 'researcher', labName: t.config.lab.name, expiresAt: expect.any(String) });
    expect(Date.parse(info.body.expiresAt) - Date.now()).toBeGreaterThan(7 * 24 * HOUR - 60_000);

    const { agent, csrf } = await agentWithCsrf(t.app);
    // Every write needs the CSRF token, this one too.
    expect((await agent.post(`/api/auth/invitation/${token}`).send({ password: 'oren-chooses-this' })).body.error.code).toBe('csrf_invalid');
    const short = await agent.post(`/api/auth/invitation/${token}`).set('x-csrf-token', csrf).send({ password: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error).toMatchObject({ code: 'validation_failed', details: [{ path: 'password', message: expect.any(String) }] });

    const accepted = await agent.post(`/api/auth/invitation/${token}`).set('x-csrf-token', csrf).send({ password: 'oren-chooses-this' });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user).toMatchObject({ email: 'oren.sallow@lab.test', name: 'Oren Sallow', role: 'researcher' });
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user.email).toBe('oren.sallow@lab.test');

    const [row] = await query<{ password_hash: string; used_at: Date | null }>(
      `SELECT u.password_hash, t.used_at FROM users u JOIN user_tokens t ON t.user_id = u.id WHERE u.email = 'oren.sallow@lab.test'`,
    );
    expect(row!.password_hash).toMatch(/^\$2[aby]\$12\$/);
    expect(row!.used_at).not.toBeNull();

    const second = await agentWithCsrf(t.app);
    const reuse = await second.agent.post(`/api/auth/invitation/${token}`).set('x-csrf-token', second.csrf).send({ password: 'someone-else-pw' });
    expect(reuse.status).toBe(410);
    expect(reuse.body.error).toMatchObject({ code: 'token_invalid', details: { reason: 'used' } });
    expect(reuse.body.error.message).toMatch(/already been used/);
    await second.agent.get('/api/auth/me').expect(401);
    expect((await request(t.app).get(`/api/auth/invitation/${token}`)).status).toBe(410);

    await signIn(t.app, 'oren.sallow@lab.test', 'oren-chooses-this');
    const list = await manager.agent.get('/api/users').expect(200);
    expect(list.body.users.find((u: { email: string }) => u.email === 'oren.sallow@lab.test')).toMatchObject({ invited: false, invitationExpiresAt: null });
    // Once the password is set the address counts as taken.
    expect((await invite({ email: 'oren.sallow@lab.test', name: 'Oren', role: 'visitor' })).status).toBe(409);
  });

  it('refuses an expired invitation and leaves the account without a password', async () => {
    await invite({ email: 'tamsin.reed@lab.test', name: 'Tamsin Reed', role: 'visitor' });
    const token = linkToken((await mailTo('tamsin.reed@lab.test'))[0]!.text, 'invitation');
    await t.db.sequelize.query(`UPDATE user_tokens SET expires_at = now() - interval '1 minute' WHERE token_hash = :h`, { replacements: { h: sha256(token) } });

    const info = await request(t.app).get(`/api/auth/invitation/${token}`);
    expect(info.status).toBe(410);
    expect(info.body.error).toMatchObject({ code: 'token_invalid', details: { reason: 'expired' } });
    expect(info.body.error.message).toMatch(/Ask a lab manager/);
    const { agent, csrf } = await agentWithCsrf(t.app);
    const res = await agent.post(`/api/auth/invitation/${token}`).set('x-csrf-token', csrf).send({ password: 'tamsin-too-late' });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('token_invalid');
    expect((await query<{ password_hash: string | null }>(`SELECT password_hash FROM users WHERE email = 'tamsin.reed@lab.test'`))[0]!.password_hash).toBeNull();
    await agent.get('/api/auth/me').expect(401);
  });

  it('answers an unknown or malformed token with 404 token_invalid', async () => {
    for (const token of ['A'.repeat(43), 'not-a-token']) {
      const res = await request(t.app).get(`/api/auth/invitation/${token}`);
      expect(res.status).toBe(404);
      expect(res.body.error).toMatchObject({ code: 'token_invalid', details: { reason: 'unknown' } });
    }
  });
});

describe('POST /api/auth/forgot-password', () => {
  const ask = async (email: string) => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    return agent.post('/api/auth/forgot-password').set('x-csrf-token', csrf).send({ email });
  };

  it('answers byte-identically for an existing and an unknown address, and queues mail only for the existing one', async () => {
    const existing = await ask('Researcher@lab.test');
    const unknown = await ask('nobody-here@lab.test');
    expect(existing.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(existing.text).toBe(unknown.text);
    expect(existing.headers['content-type']).toBe(unknown.headers['content-type']);
    expect(existing.body).toEqual(forgotPasswordAnswer);

    expect(await outboxCount('researcher@lab.test', 'password-reset')).toBe(1);
    expect(await outboxCount('nobody-here@lab.test', 'password-reset')).toBe(0);
    const [message] = await mailTo('researcher@lab.test');
    expect(message!.subject).toBe(`Choose a new Skewbench password (${t.config.lab.name})`);
    const token = linkToken(message!.text, 'reset-password');
    expect(message!.html).toContain(`${PUBLIC_URL}/reset-password/${token}`);
    const [row] = await query<{ expires_at: Date; created_at: Date; purpose: string }>('SELECT expires_at, created_at, purpose FROM user_tokens WHERE token_hash = :h', { h: sha256(token) });
    expect(row!.purpose).toBe('password-reset');
    expect(Math.abs(row!.expires_at.getTime() - row!.created_at.getTime() - HOUR)).toBeLessThan(60_000);
  });

  it('sends nothing to an invitee without a password or a deactivated account, with the same answer', async () => {
    await invite({ email: 'wenna.fold@lab.test', name: 'Wenna Fold', role: 'visitor' });
    const created = await manager.agent.post('/api/users').set('x-csrf-token', manager.csrf).send({ email: 'gone.soon@lab.test', name: 'Gone Soon', role: 'visitor', password: 'gone-soon-pass' });
    await manager.agent.patch(`/api/users/${created.body.user.id}`).set('x-csrf-token', manager.csrf).send({ active: false }).expect(200);
    const reference = await ask('nobody-at-all@lab.test');
    for (const email of ['wenna.fold@lab.test', 'gone.soon@lab.test']) {
      const res = await ask(email);
      expect(res.status).toBe(202);
      expect(res.text).toBe(reference.text);
      expect(await outboxCount(email, 'password-reset')).toBe(0);
    }
  });

  it('is rate-limited per address like sign-in: 429 after the allowed number of requests', async () => {
    for (let i = 0; i < 5; i++) expect((await ask('flood@lab.test')).status).toBe(202);
    const limited = await ask('flood@lab.test');
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('rate_limited');
  });

  it('refuses a malformed address with 400 validation_failed JSON', async () => {
    const res = await ask('not an address');
    expect(res.status).toBe(400);
    expect(res.body.error).toMatchObject({ code: 'validation_failed', details: [{ path: 'email', message: expect.any(String) }] });
  });
});

describe('POST /api/auth/reset-password/:token', () => {
  const requestLink = async (email: string) => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    await agent.post('/api/auth/forgot-password').set('x-csrf-token', csrf).send({ email }).expect(202);
    const messages = await mailTo(email);
    return linkToken(messages.at(-1)!.text, 'reset-password');
  };
  const reset = async (token: string, password: string) => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    return agent.post(`/api/auth/reset-password/${token}`).set('x-csrf-token', csrf).send({ password });
  };

  it('sets the new password once, ends every session of the person, and retires their other links', async () => {
    const laptop = await signIn(t.app, 'researcher2@lab.test');
    const phone = await signIn(t.app, 'researcher2@lab.test');
    const bystander = await signIn(t.app, 'visitor@lab.test');
    const older = await requestLink('researcher2@lab.test');
    const token = await requestLink('researcher2@lab.test');
    // Only the newest link works.
    expect((await request(t.app).get(`/api/auth/reset-password/${older}`)).status).toBe(410);
    const info = await request(t.app).get(`/api/auth/reset-password/${token}`).expect(200);
    expect(info.body.email).toBe('researcher2@lab.test');

    const res = await reset(token, 'a-brand-new-secret');
    expect(res.status).toBe(200);
    expect(res.body.message).toMatch(/Sign in with the new password/);

    await laptop.agent.get('/api/auth/me').expect(401);
    await phone.agent.get('/api/auth/me').expect(401);
    await bystander.agent.get('/api/auth/me').expect(200);
    expect(await query(`SELECT sid FROM sessions WHERE (sess ->> 'userId') = :id`, { id: String(laptop.user.id) })).toEqual([]);

    const { agent, csrf } = await agentWithCsrf(t.app);
    expect((await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'researcher2@lab.test', password: DEMO_PASSWORD })).status).toBe(401);
    await signIn(t.app, 'researcher2@lab.test', 'a-brand-new-secret');

    const reuse = await reset(token, 'yet-another-secret');
    expect(reuse.status).toBe(410);
    expect(reuse.body.error).toMatchObject({ code: 'token_invalid', details: { reason: 'used' } });
    expect(reuse.body.error.message).toMatch(/request a new link/i);
    const stillOld = await reset(older, 'yet-another-secret');
    expect(stillOld.status).toBe(410);
    await signIn(t.app, 'researcher2@lab.test', 'a-brand-new-secret');
  });

  it('refuses a link older than its hour', async () => {
    const token = await requestLink('researcher@lab.test');
    // The link was mailed 61 minutes ago.
    await t.db.sequelize.query(
      `UPDATE user_tokens SET created_at = created_at - interval '61 minutes', expires_at = expires_at - interval '61 minutes' WHERE token_hash = :h`,
      { replacements: { h: sha256(token) } },
    );
    const res = await reset(token, 'too-late-secret-1');
    expect(res.status).toBe(410);
    expect(res.body.error).toMatchObject({ code: 'token_invalid', details: { reason: 'expired' } });
    expect(res.body.error.message).toMatch(/Request a new link/);
    await signIn(t.app, 'researcher@lab.test', DEMO_PASSWORD);
  });

  it('refuses a weak password with 400 and leaves the link usable', async () => {
    const token = await requestLink('visitor@lab.test');
    const res = await reset(token, 'short');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    await request(t.app).get(`/api/auth/reset-password/${token}`).expect(200);
  });
});

describe('notification choices: /api/auth/me/notifications', () => {
  it('needs a signed-in person', async () => {
    const res = await request(t.app).get('/api/auth/me/notifications');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('lists the topics of the role, all on by default, and says what cannot be switched off', async () => {
    const researcher = await signIn(t.app, 'researcher@lab.test');
    const res = await researcher.agent.get('/api/auth/me/notifications').expect(200);
    expect(res.body.topics.map((topic: { key: string; receive: boolean }) => [topic.key, topic.receive])).toEqual([
      ['bookingUpdates', true],
      ['waitlistOffers', true],
    ]);
    expect(res.body.topics[0]).toMatchObject({ label: expect.any(String), description: expect.any(String) });
    expect(res.body.alwaysSent.map((x: { label: string }) => x.label)).toEqual(['Handover notes', 'Security messages']);
    expect(res.body.note).toMatch(/cannot be switched off/);

    const managerView = await manager.agent.get('/api/auth/me/notifications').expect(200);
    expect(managerView.body.topics.map((topic: { key: string }) => topic.key)).toEqual(['bookingUpdates', 'waitlistOffers', 'calibrationDigest']);
    const visitor = await signIn(t.app, 'visitor@lab.test');
    expect((await visitor.agent.get('/api/auth/me/notifications').expect(200)).body.topics).toEqual([]);
  });

  it('stores a change, returns it, and the outbox honours it', async () => {
    const researcher = await signIn(t.app, 'researcher@lab.test');
    const put = await researcher.agent.put('/api/auth/me/notifications').set('x-csrf-token', researcher.csrf).send({ waitlistOffers: false });
    expect(put.status).toBe(200);
    expect(put.body.topics.find((x: { key: string }) => x.key === 'waitlistOffers').receive).toBe(false);
    const again = await researcher.agent.get('/api/auth/me/notifications').expect(200);
    expect(again.body.topics.map((x: { key: string; receive: boolean }) => [x.key, x.receive])).toEqual([
      ['bookingUpdates', true],
      ['waitlistOffers', false],
    ]);
    const [row] = await query<{ notification_settings: Record<string, boolean> }>(`SELECT notification_settings FROM users WHERE id = :id`, { id: researcher.user.id });
    expect(row!.notification_settings).toEqual({ waitlistOffers: false });

    const render = () => ({ subject: 's', text: 't', html: '<p>h</p>' });
    const [offer, handover] = await t.db.sequelize.transaction(async (transaction) => [
      await enqueueForUser(transaction, 'waitlist-offer', researcher.user.id, render),
      await enqueueForUser(transaction, 'handover', researcher.user.id, render),
    ]);
    expect(offer).toBeNull();
    expect(handover).toEqual(expect.any(Number));
    await t.db.sequelize.query('DELETE FROM outbox WHERE id = :id', { replacements: { id: handover } });

    const back = await researcher.agent.put('/api/auth/me/notifications').set('x-csrf-token', researcher.csrf).send({ waitlistOffers: true, bookingUpdates: true });
    expect(back.body.topics.every((x: { receive: boolean }) => x.receive)).toBe(true);
  });

  it('refuses bad input with 400 validation_failed JSON and changes nothing', async () => {
    const researcher = await signIn(t.app, 'researcher@lab.test');
    const before = (await query<{ notification_settings: unknown }>(`SELECT notification_settings FROM users WHERE id = :id`, { id: researcher.user.id }))[0];
    for (const [body, path] of [
      [{ bookingUpdates: 'no' }, 'bookingUpdates'],
      [{ handover: false }, ''],
      [{ calibrationDigest: false }, 'calibrationDigest'],
    ] as const) {
      const res = await researcher.agent.put('/api/auth/me/notifications').set('x-csrf-token', researcher.csrf).send(body);
      expect(res.status).toBe(400);
      expect(res.headers['content-type']).toMatch(/application\/json/);
      expect(res.body.error.code).toBe('validation_failed');
      expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(path);
    }
    const after = (await query<{ notification_settings: unknown }>(`SELECT notification_settings FROM users WHERE id = :id`, { id: researcher.user.id }))[0];
    expect(after).toEqual(before);
  });
});
