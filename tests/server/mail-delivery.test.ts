// Delivery of the outbox: queued in the transaction of a change, sent by the worker over real SMTP (nodemailer
// to the local smtp-server capture, parsed by mailparser), retried while the server is away, never doubled.
import nodemailer, { type Transporter } from 'nodemailer';
import { QueryTypes, type Sequelize } from 'sequelize';
import { SMTPServer } from 'smtp-server';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { freePort } from '../../scripts/lib/postgres.mjs';
import { retryDelayMs, type MailKind } from '../../shared/domain/notifications.js';
import { createSequelize } from '../../server/db/sequelize.js';
import { enqueueMail } from '../../server/features/mail/outbox.service.js';
import { drainOutbox } from '../../server/features/mail/outbox.worker.js';
import { startMailCapture, type MailCapture } from '../../server/features/mail/smtp-capture.js';
import { signIn, startTestApp, type TestApp } from '../support/test-app.js';

// The app without a background worker, so each test decides when the outbox is drained (sendNow); the local
// capture server runs as `npm start` runs it. The runtime's own worker is tested at the end.
let t: TestApp;
let capture: MailCapture;
let transport: Transporter;
beforeAll(async () => {
  t = await startTestApp({ PUBLIC_URL: 'https://bench.lab.test' });
  capture = await startMailCapture(t.db.sequelize, { port: 0 });
  transport = smtpTo(capture.port);
});
afterAll(async () => {
  transport.close();
  await capture.close();
  await t.close();
});
beforeEach(async () => {
  await t.db.sequelize.query('DELETE FROM outbox; DELETE FROM captured_mail;');
});
const sendNow = () => drainOutbox(worker(transport, { now: new Date() }));

const query = <T extends object>(sql: string, replacements: Record<string, unknown> = {}, sequelize: Sequelize = t.db.sequelize) =>
  sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });

const mail = (n: number) => ({ subject: `Test message ${n}`, text: `Plain text ${n}`, html: `<p>HTML <b>${n}</b></p>` });

async function queue(count: number, to = 'ada.quill@lab.test', kind: MailKind = 'booking-confirmed'): Promise<number[]> {
  const ids: number[] = [];
  await t.db.sequelize.transaction(async (transaction) => {
    for (let i = 0; i < count; i++) ids.push(await enqueueMail(transaction, kind, { address: to }, mail(i)));
  });
  return ids;
}

/** A worker's options for a transport; `clock` lets a test step past the backoff instead of waiting for it. */
function worker(transport: Transporter, clock: { now: Date }, sequelize: Sequelize = t.db.sequelize) {
  return { sequelize, transport, from: 'Skewbench <skewbench@lab.test>', messageIdHost: 'bench.lab.test', now: () => clock.now };
}

const smtpTo = (port: number) => nodemailer.createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true, connectionTimeout: 2000, greetingTimeout: 2000 });

describe('outbox delivery to the local SMTP capture', () => {
  it('queues in the transaction, sends once, and the manager reads it at GET /api/mailbox', async () => {
    const [id] = await queue(1);
    expect((await query<{ status: string }>('SELECT status FROM outbox WHERE id = :id', { id }))[0]!.status).toBe('pending');
    await sendNow();

    const [row] = await query<{ status: string; attempts: number; message_id: string; sent_at: Date | null }>('SELECT status, attempts, message_id, sent_at FROM outbox WHERE id = :id', { id });
    expect(row).toMatchObject({ status: 'sent', attempts: 1, message_id: `<outbox-${id}@bench.lab.test>` });
    expect(row!.sent_at).not.toBeNull();

    const { agent } = await signIn(t.app, 'manager@lab.test');
    const list = await agent.get('/api/mailbox').expect(200);
    expect(list.body).toHaveLength(1);
    expect(list.body[0]).toMatchObject({ to: 'ada.quill@lab.test', subject: 'Test message 0', from: '"Skewbench" <skewbench@lab.test>', messageId: `<outbox-${id}@bench.lab.test>`, hasHtml: true });
    expect(Date.parse(list.body[0].receivedAt)).not.toBeNaN();
    const one = await agent.get(`/api/mailbox/${list.body[0].id}`).expect(200);
    expect(one.body.message.text.trim()).toBe('Plain text 0');
    expect(one.body.message.html).toContain('<b>0</b>');
    const html = await agent.get(`/api/mailbox/${list.body[0].id}/html`).expect(200);
    expect(html.headers['content-security-policy']).toContain("default-src 'none'");
    expect(html.headers['content-security-policy']).toContain('sandbox');
  });

  it('keeps attachments: name, type and bytes', async () => {
    const bytes = Buffer.from('BEGIN:VCALENDAR\r\nEND:VCALENDAR\r\n');
    await t.db.sequelize.transaction((transaction) =>
      enqueueMail(transaction, 'booking-confirmed', { address: 'ada.quill@lab.test' }, { ...mail(1), attachments: [{ filename: 'booking.ics', contentType: 'text/calendar', content: bytes.toString('base64') }] }),
    );
    await sendNow();
    const { agent } = await signIn(t.app, 'manager@lab.test');
    const [message] = (await agent.get('/api/mailbox').expect(200)).body;
    expect(message.attachments).toEqual([{ index: 0, filename: 'booking.ics', contentType: 'text/calendar', size: bytes.length }]);
    const file = await agent.get(`/api/mailbox/${message.id}/attachments/0`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    }).expect(200);
    expect(file.headers['content-disposition']).toContain('booking.ics');
    expect(Buffer.compare(file.body as Buffer, bytes)).toBe(0);
    await agent.get(`/api/mailbox/${message.id}/attachments/5`).expect(404);
  });

  it('a failed transaction leaves no outbox row', async () => {
    await expect(
      t.db.sequelize.transaction(async (transaction) => {
        await enqueueMail(transaction, 'invitation', { address: 'ada.quill@lab.test' }, mail(2));
        throw new Error('the change itself failed');
      }),
    ).rejects.toThrow('the change itself failed');
    expect(await query('SELECT id FROM outbox')).toEqual([]);
    await sendNow();
    expect(await query('SELECT id FROM captured_mail')).toEqual([]);
  });

  it('SMTP unreachable for a while: mail stays queued with backoff, then goes out once, none lost, none doubled', async () => {
    const port = await freePort();
    const ids = await queue(5);
    const clock = { now: new Date() };
    const down = smtpTo(port);

    // Nobody listens on the port: the first row is tried, fails, and the pass stops.
    const first = await drainOutbox(worker(down, clock));
    expect(first).toEqual({ sent: 0, retried: 1, failed: 0 });
    let rows = await query<{ id: string; status: string; attempts: number; next_attempt_at: Date; last_error: string }>('SELECT id, status, attempts, next_attempt_at, last_error FROM outbox ORDER BY id');
    expect(rows.map((r) => r.status)).toEqual(['pending', 'pending', 'pending', 'pending', 'pending']);
    expect(rows[0]!.attempts).toBe(1);
    expect(rows[0]!.last_error).toMatch(/ECONNREFUSED|ECONNECTION|ESOCKET/);
    expect(rows[0]!.next_attempt_at.getTime() - clock.now.getTime()).toBe(retryDelayMs(1));

    // Still down a little later: the others are tried in turn, each backs off.
    clock.now = new Date(clock.now.getTime() + 1000);
    expect((await drainOutbox(worker(down, clock))).retried).toBe(1);

    // The server comes back on that port.
    const back = await startMailCapture(t.db.sequelize, { port });
    try {
      clock.now = new Date(clock.now.getTime() + retryDelayMs(2) + 1000);
      const result = await drainOutbox(worker(down, clock));
      expect(result).toEqual({ sent: 5, retried: 0, failed: 0 });
      // A later pass finds nothing more to send.
      expect(await drainOutbox(worker(down, clock))).toEqual({ sent: 0, retried: 0, failed: 0 });
    } finally {
      down.close();
      await back.close();
    }
    rows = await query('SELECT id, status, attempts FROM outbox ORDER BY id');
    expect(rows.map((r) => r.status)).toEqual(['sent', 'sent', 'sent', 'sent', 'sent']);
    const captured = await query<{ message_id: string }>('SELECT message_id FROM captured_mail ORDER BY message_id');
    expect(captured.map((c) => c.message_id).sort()).toEqual(ids.map((id) => `<outbox-${id}@bench.lab.test>`).sort());
  });

  it('two workers draining the same outbox at once send each message exactly once', async () => {
    const ids = await queue(40);
    // A second, independent connection pool, as a second server instance has.
    const other = createSequelize(t.config.db);
    // Each send takes a little longer than on an idle machine, so both workers are still draining when the other
    // starts: the test then shows that they skip each other's locked rows, rather than that one was quicker.
    const slow = (transport: Transporter) => {
      const send = transport.sendMail.bind(transport);
      return Object.assign(transport, { sendMail: async (m: Parameters<typeof send>[0]) => (await new Promise((r) => setTimeout(r, 15)), send(m)) }) as Transporter;
    };
    const [a, b] = [slow(smtpTo(capture.port)), slow(smtpTo(capture.port))];
    try {
      const clock = { now: new Date() };
      const [ra, rb] = await Promise.all([drainOutbox(worker(a, clock)), drainOutbox(worker(b, clock, other))]);
      expect(ra.sent + rb.sent).toBe(40);
      // Both really took part (SKIP LOCKED let each pass the other's locked row), so the test proves something.
      expect(ra.sent).toBeGreaterThan(0);
      expect(rb.sent).toBeGreaterThan(0);
    } finally {
      a.close();
      b.close();
      await other.close();
    }
    const counts = await query<{ message_id: string; n: number }>('SELECT message_id, count(*)::int AS n FROM captured_mail GROUP BY message_id');
    expect(counts).toHaveLength(40);
    expect(counts.every((c) => c.n === 1)).toBe(true);
    expect(counts.map((c) => c.message_id).sort()).toEqual(ids.map((id) => `<outbox-${id}@bench.lab.test>`).sort());
    expect(await query("SELECT id FROM outbox WHERE status <> 'sent'")).toEqual([]);
  });

  it('a refusal of the message (550) marks it failed; 4xx and authentication errors (535) are retried; a manager requeues a failed one', async () => {
    let answer = 550;
    const port = await freePort();
    const refusing = new SMTPServer({
      disabledCommands: ['STARTTLS', 'AUTH'],
      authOptional: true,
      logger: false,
      onRcptTo(_address, _session, callback) {
        const text = { 550: 'No such mailbox here', 451: 'Try again later', 535: 'Authentication credentials invalid' }[answer];
        callback(Object.assign(new Error(text), { responseCode: answer }));
      },
    });
    await new Promise<void>((resolve) => refusing.listen(port, '127.0.0.1', () => resolve()));
    const refused = smtpTo(port);
    try {
      // A minute ahead, so rows queued during the test are due.
      const clock = { now: new Date(Date.now() + 60_000) };
      const [permanent] = await queue(1, 'nobody@lab.test');
      expect(await drainOutbox(worker(refused, clock))).toEqual({ sent: 0, retried: 0, failed: 1 });
      expect((await query<{ status: string; last_error: string }>('SELECT status, last_error FROM outbox WHERE id = :id', { id: permanent }))[0]).toMatchObject({ status: 'failed', last_error: expect.stringContaining('550') });

      for (const code of [451, 535]) {
        answer = code;
        const [again] = await queue(1, `busy-${code}@lab.test`);
        expect(await drainOutbox(worker(refused, clock))).toEqual({ sent: 0, retried: 1, failed: 0 });
        expect((await query<{ status: string; attempts: number }>('SELECT status, attempts FROM outbox WHERE id = :id', { id: again }))[0]).toMatchObject({ status: 'pending', attempts: 1 });
        await t.db.sequelize.query('DELETE FROM outbox WHERE id = :id', { replacements: { id: again } });
      }

      // The address is fixed at the relay: the manager puts the failed message back, and it goes out.
      const { agent, csrf } = await signIn(t.app, 'manager@lab.test');
      expect((await agent.post('/api/outbox/999999/retry').set('x-csrf-token', csrf).expect(404)).body.error.code).toBe('not_found');
      expect((await agent.post(`/api/outbox/${permanent}/retry`).set('x-csrf-token', csrf).expect(200)).body).toEqual({ requeued: 1 });
      expect(await sendNow()).toEqual({ sent: 1, retried: 0, failed: 0 });
      expect((await query<{ status: string }>('SELECT status FROM outbox WHERE id = :id', { id: permanent }))[0]!.status).toBe('sent');
    } finally {
      refused.close();
      await new Promise<void>((resolve) => refusing.close(() => resolve()));
    }
  });

  it('keeps no live one-time link in the outbox once an invitation or reset is sent', async () => {
    const [invitation] = await queue(1, 'new.person@lab.test', 'invitation');
    const [confirmation] = await queue(1, 'new.person@lab.test', 'booking-confirmed');
    await sendNow();
    const rows = await query<{ id: string; text_body: string; html_body: string }>('SELECT id, text_body, html_body FROM outbox ORDER BY id');
    const byId = Object.fromEntries(rows.map((r) => [Number(r.id), r]));
    expect(byId[invitation!]!.text_body).toMatch(/^\(Removed after sending/);
    expect(byId[invitation!]!.html_body).toMatch(/^\(Removed after sending/);
    expect(byId[confirmation!]!.text_body).toBe('Plain text 0');
    // The recipient's copy is whole.
    expect((await query<{ text_body: string }>('SELECT text_body FROM captured_mail ORDER BY id'))[0]!.text_body.trim()).toBe('Plain text 0');
  });
});

describe('GET /api/mailbox and /api/outbox', () => {
  it('are for lab managers only', async () => {
    await request(t.app).get('/api/mailbox').expect(401);
    const { agent } = await signIn(t.app, 'researcher@lab.test');
    const res = await agent.get('/api/mailbox').expect(403);
    expect(res.body.error.code).toBe('forbidden');
    await agent.get('/api/outbox').expect(403);
  });

  it('filters by recipient and refuses bad filters with a clear error', async () => {
    await queue(2, 'ada.quill@lab.test');
    await queue(1, 'bo.ferrite@lab.test');
    await sendNow();
    const { agent } = await signIn(t.app, 'manager@lab.test');
    expect((await agent.get('/api/mailbox').expect(200)).body).toHaveLength(3);
    const bo = (await agent.get('/api/mailbox?to=Bo.Ferrite@lab.test').expect(200)).body;
    expect(bo.map((m: { to: string }) => m.to)).toEqual(['bo.ferrite@lab.test']);
    const bad = await agent.get('/api/mailbox?limit=zero&to=not-an-address').expect(400);
    expect(bad.body.error.code).toBe('validation_failed');
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['query.limit', 'query.to']);
    await agent.get('/api/mailbox/999999').expect(404);
  });

  it('shows the outbox queue with counts per status', async () => {
    await queue(2);
    const { agent } = await signIn(t.app, 'manager@lab.test');
    let res = await agent.get('/api/outbox').expect(200);
    expect(res.body.counts).toEqual({ pending: 2, sent: 0, failed: 0 });
    expect(res.body.entries[0]).toMatchObject({ kind: 'booking-confirmed', to: 'ada.quill@lab.test', status: 'pending', attempts: 0 });
    await sendNow();
    res = await agent.get('/api/outbox?status=sent').expect(200);
    expect(res.body.counts).toEqual({ pending: 0, sent: 2, failed: 0 });
    expect(res.body.sentCountDays).toBe(7);
    expect(res.body.entries).toHaveLength(2);
    expect((await agent.get('/api/outbox?status=lost').expect(400)).body.error.code).toBe('validation_failed');
  });

  it('a manager can clear the captured mail', async () => {
    await queue(1);
    await sendNow();
    const { agent, csrf } = await signIn(t.app, 'manager@lab.test');
    expect((await agent.delete('/api/mailbox').set('x-csrf-token', csrf).expect(200)).body).toEqual({ deleted: 1 });
    expect((await agent.get('/api/mailbox').expect(200)).body).toEqual([]);
  });
});

describe('the mail runtime of a server process', () => {
  it('sends queued mail as soon as the transaction commits, without waiting for the poll', async () => {
    const live = await startTestApp({}, { mail: true, mailPollMs: 60_000 });
    try {
      await live.db.sequelize.transaction((transaction) => enqueueMail(transaction, 'invitation', { address: 'ada.quill@lab.test' }, mail(7)));
      await expect.poll(async () => (await query<{ subject: string }>('SELECT subject FROM captured_mail', {}, live.db.sequelize)).map((m) => m.subject)).toEqual(['Test message 7']);
      expect(live.mail!.capture!.port).toBeGreaterThan(0);
    } finally {
      await live.close();
    }
  });
});

describe('with SMTP_URL set (the lab relay)', () => {
  let relay: TestApp;
  let relayCapture: MailCapture;
  beforeAll(async () => {
    // A stand-in relay: an SMTP server the app reaches only through SMTP_URL.
    relayCapture = await startMailCapture(t.db.sequelize, { port: 0 });
    relay = await startTestApp({ SMTP_URL: `smtp://127.0.0.1:${relayCapture.port}/?ignoreTLS=true` }, { mail: true, mailPollMs: 60_000 });
  });
  afterAll(async () => {
    await relay.close();
    await relayCapture.close();
  });

  it('sends through the relay, and the local mailbox answers mail_capture_off', async () => {
    const { agent } = await signIn(relay.app, 'manager@lab.test');
    const res = await agent.get('/api/mailbox').expect(404);
    expect(res.body.error.code).toBe('mail_capture_off');
    expect(res.body.error.message).toMatch(/SMTP_URL/);
    expect(relay.mail!.capture).toBeNull();

    await relay.db.sequelize.transaction((transaction) => enqueueMail(transaction, 'invitation', { address: 'cy.balun@lab.test' }, mail(9)));
    await relay.mail!.worker.kick();
    const got = await query<{ subject: string; envelope_to: string[] }>('SELECT subject, envelope_to FROM captured_mail');
    expect(got).toEqual([{ subject: 'Test message 9', envelope_to: ['cy.balun@lab.test'] }]);
    // The outbox page still works: it is about what Skewbench sent, whichever way.
    expect((await agent.get('/api/outbox?status=sent').expect(200)).body.counts.sent).toBe(1);
  });
});
