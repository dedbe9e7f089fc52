// The booking messages end to end: a change through the API queues its message in its own transaction, the outbox
// worker sends it over SMTP to the local capture server, and the manager reads it back at GET /api/mailbox.
import ICAL from 'ical.js';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { markNoShows } from '../../server/features/bookings/bookings.service.js';
import { runDailyDigests } from '../../server/features/mail/digests.service.js';
import { signIn, startTestApp, type TestApp } from '../support/test-app.js';
import { at } from '../support/time.js';

const PUBLIC_URL = 'https://bench.kestrel-vale.test';
const LAB_NAME = 'Kestrel Vale Microwave Circuits Lab';
const ZONE = 'Europe/Berlin';

let t: TestApp;
type Who = Awaited<ReturnType<typeof signIn>>;
let manager: Who;
let researcher: Who;
let researcher2: Who;
const tag: Record<string, number> = {};
const lab = () => ({ name: LAB_NAME, publicUrl: PUBLIC_URL, timeZone: ZONE });

beforeAll(async () => {
  // The worker's own poll is slowed down: each test drains the outbox itself with kick().
  t = await startTestApp({ PUBLIC_URL, LAB_NAME, LAB_TIMEZONE: ZONE }, { mail: true, mailPollMs: 60_000 });
  [manager, researcher, researcher2] = await Promise.all([signIn(t.app, 'manager@lab.test'), signIn(t.app, 'researcher@lab.test'), signIn(t.app, 'researcher2@lab.test')]);
  for (const i of (await manager.agent.get('/api/instruments')).body.instruments) tag[i.tag] = i.id;
  // These tests book slots relative to the moment they run; the demo's bookings would collide at some hours.
  await t.db.sequelize.query('DELETE FROM waitlist_entries; DELETE FROM bookings;');
});
afterAll(() => t.close());
beforeEach(async () => {
  await t.db.sequelize.query(`DELETE FROM outbox; DELETE FROM captured_mail; UPDATE users SET notification_settings = '{}'`);
});

const query = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) => t.db.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
const post = (who: Who, url: string, body: object = {}) => who.agent.post(url).set('x-csrf-token', who.csrf).send(body);
const book = (who: Who, body: Record<string, unknown>) => post(who, '/api/bookings', { purpose: 'Measurement', ...body });
const outboxRows = (kind?: string) =>
  query<{ kind: string; to_address: string; status: string }>(`SELECT kind, to_address, status FROM outbox WHERE (:kind::text IS NULL OR kind = :kind) ORDER BY id`, { kind: kind ?? null });

interface Captured {
  id: number;
  to: string;
  subject: string;
  attachments: { index: number; filename: string; contentType: string; size: number }[];
  text: string;
  html: string;
}

/** Send what is queued, then every captured message to `to` (oldest first), with its text and HTML. */
async function delivered(to: string): Promise<Captured[]> {
  await t.mail!.worker.kick();
  const list = (await manager.agent.get(`/api/mailbox?to=${encodeURIComponent(to)}`).expect(200)).body as Omit<Captured, 'text' | 'html'>[];
  const full: Captured[] = [];
  for (const m of list.reverse()) full.push({ ...m, ...(await manager.agent.get(`/api/mailbox/${m.id}`).expect(200)).body.message });
  return full;
}

/** `13:00` on the lab's clock: what the messages must show for a UTC instant. */
const labClock = (iso: string) => new Intl.DateTimeFormat('en-GB', { timeZone: ZONE, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(iso));
/** Every link of the HTML part. */
const hrefs = (html: string) => [...html.matchAll(/href="([^"]+)"/g)].map((m) => m[1]!.replace(/&amp;/g, '&'));

async function attachment(messageId: number, index: number): Promise<string> {
  const res = await manager.agent
    .get(`/api/mailbox/${messageId}/attachments/${index}`)
    .buffer(true)
    .parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    })
    .expect(200);
  return (res.body as Buffer).toString('utf8');
}

describe('booking confirmed', () => {
  it('reaches the owner with the lab-time slot, an absolute link and the booking as an .ics with its UID and UTC times', async () => {
    const startsAt = at(3, 19);
    const endsAt = at(3, 21, 30);
    const res = await book(researcher, { instrumentIds: [tag['SG-1'], tag['SA-1']], startsAt, endsAt, purpose: 'LO phase noise, lot 12', projectCode: 'RX-7' });
    expect(res.status).toBe(201);
    const id: number = res.body.booking.id;

    const [mail, ...more] = await delivered('researcher@lab.test');
    expect(more).toHaveLength(0);
    expect(mail!.subject).toMatch(/^Booked: SA-1 \+ SG-1, /);
    // Europe/Berlin is UTC+1 in winter and UTC+2 in summer (EU Directive 2000/84/EC); the slot is 3 days from now.
    const offsetHours = Math.round((Date.parse(new Date(startsAt).toLocaleString('en-US', { timeZone: ZONE })) - Date.parse(new Date(startsAt).toLocaleString('en-US', { timeZone: 'UTC' }))) / 3_600_000);
    expect(mail!.subject).toContain(`${labClock(startsAt)}–${labClock(endsAt)} (Europe/Berlin, UTC+${offsetHours})`);
    expect(mail!.text).toContain('Hello Tobiah Renwick,');
    expect(mail!.text).toContain('SG-1 (Signal generator, 9 kHz to 20 GHz (KV-SG20))');
    expect(mail!.text).toContain(`Open the booking: ${PUBLIC_URL}/bookings/${id}`);
    expect(mail!.text).toContain(LAB_NAME);
    expect(hrefs(mail!.html)).toContain(`${PUBLIC_URL}/bookings/${id}`);
    expect((await outboxRows()).map((r) => [r.kind, r.to_address, r.status])).toEqual([['booking-confirmed', 'researcher@lab.test', 'sent']]);

    expect(mail!.attachments).toEqual([{ index: 0, filename: `booking-${id}.ics`, contentType: 'text/calendar', size: expect.any(Number) }]);
    const ics = await attachment(mail!.id, 0);
    const calendar = new ICAL.Component(ICAL.parse(ics));
    expect(calendar.getFirstPropertyValue('method')).toBe('PUBLISH');
    const [event, ...others] = calendar.getAllSubcomponents('vevent');
    expect(others).toHaveLength(0);
    // The same UID as the calendar feeds give the booking, so a calendar holding both shows one event.
    expect(event!.getFirstPropertyValue('uid')).toBe(`booking-${id}@bench.kestrel-vale.test`);
    expect(event!.getFirstProperty('dtstart')!.toICALString()).toMatch(/^DTSTART:\d{8}T\d{6}Z$/);
    expect((event!.getFirstPropertyValue('dtstart') as ICAL.Time).toJSDate().toISOString()).toBe(startsAt);
    expect((event!.getFirstPropertyValue('dtend') as ICAL.Time).toJSDate().toISOString()).toBe(endsAt);
    expect(event!.getFirstProperty('dtstamp')!.toICALString()).toMatch(/^DTSTAMP:\d{8}T\d{6}Z$/);
    expect(event!.getFirstPropertyValue('summary')).toBe('SA-1 + SG-1 · LO phase noise, lot 12');
    expect(String(event!.getFirstPropertyValue('location'))).toContain('rack A');
    expect(String(event!.getFirstPropertyValue('url'))).toBe(`${PUBLIC_URL}/bookings/${id}`);
  });

  it('sends nothing for a maintenance block', async () => {
    const res = await book(manager, { instrumentIds: [tag['OS-1']], startsAt: at(9, 8), endsAt: at(9, 12), kind: 'maintenance', purpose: 'Firmware update' });
    expect(res.status).toBe(201);
    expect(await outboxRows()).toEqual([]);
  });
});

describe('a booking transaction that fails leaves no outbox row', () => {
  it('a clash (409) queues nothing', async () => {
    const res = await book(researcher2, { instrumentIds: [tag['SG-1']], startsAt: at(3, 20), endsAt: at(3, 21) });
    expect(res.status).toBe(409);
    expect(await outboxRows()).toEqual([]);
  });

  it('of 12 simultaneous requests for one slot, only the booking that was made queues a confirmation', async () => {
    const results = await Promise.all(
      Array.from({ length: 12 }, (_, n) => book(n % 2 ? researcher : researcher2, { instrumentIds: [tag['SG-2']], startsAt: at(8, 19, n * 2), endsAt: at(8, 21) })),
    );
    const made = results.filter((r) => r.status === 201);
    expect(made).toHaveLength(1);
    expect(results.filter((r) => r.status === 409)).toHaveLength(11);
    const owner = made[0]!.body.booking.owner.id === researcher.user.id ? 'researcher@lab.test' : 'researcher2@lab.test';
    expect((await outboxRows()).map((r) => [r.kind, r.to_address])).toEqual([['booking-confirmed', owner]]);
  });

  it('a booking refused at COMMIT, after its message was queued, takes the message with it', async () => {
    // A deferred constraint trigger fails the transaction at its very end, after every write, the outbox row included.
    await t.db.sequelize.query(`
      CREATE FUNCTION test_refuse_at_commit() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN IF NEW.purpose = 'Refused at commit' THEN RAISE EXCEPTION 'refused at commit (test)'; END IF; RETURN NULL; END $$;
      CREATE CONSTRAINT TRIGGER test_refuse_at_commit AFTER INSERT ON bookings DEFERRABLE INITIALLY DEFERRED
        FOR EACH ROW EXECUTE FUNCTION test_refuse_at_commit();`);
    try {
      const res = await book(researcher, { instrumentIds: [tag['PSU-1']], startsAt: at(9, 19), endsAt: at(9, 20), purpose: 'Refused at commit' });
      expect(res.status).toBe(500);
      expect(await query(`SELECT id FROM bookings WHERE purpose = 'Refused at commit'`)).toEqual([]);
      expect(await outboxRows()).toEqual([]);
    } finally {
      await t.db.sequelize.query('DROP TRIGGER test_refuse_at_commit ON bookings; DROP FUNCTION test_refuse_at_commit();');
    }
    // The same request without the trap books and queues as usual.
    expect((await book(researcher, { instrumentIds: [tag['PSU-1']], startsAt: at(9, 19), endsAt: at(9, 20) })).status).toBe(201);
    expect((await outboxRows()).map((r) => r.kind)).toEqual(['booking-confirmed']);
  });
});

describe('booking changed and cancelled', () => {
  it('a move by a lab manager tells the owner the old and new time and who moved it', async () => {
    const created = await book(researcher, { instrumentIds: [tag['OS-1']], startsAt: at(5, 19), endsAt: at(5, 20) });
    const id: number = created.body.booking.id;
    const moved = await manager.agent.patch(`/api/bookings/${id}`).set('x-csrf-token', manager.csrf).send({ startsAt: at(5, 20), endsAt: at(5, 21, 30) });
    expect(moved.status).toBe(200);

    const mails = await delivered('researcher@lab.test');
    expect(mails.map((m) => m.subject)).toEqual([expect.stringMatching(/^Booked: OS-1, /), expect.stringMatching(/^Moved: OS-1, /)]);
    const change = mails[1]!;
    expect(change.subject).toContain(`${labClock(at(5, 20))}–${labClock(at(5, 21, 30))} (Europe/Berlin`);
    expect(change.text).toContain('Ilse Marwood, a lab manager, moved your booking of OS-1.');
    expect(change.text).toMatch(new RegExp(`It was .*, ${labClock(at(5, 19))}–${labClock(at(5, 20))} \\(Europe/Berlin, UTC\\+1\\); it is now .*, ${labClock(at(5, 20))}–${labClock(at(5, 21, 30))} `));
    expect(change.text).toMatch(/Changed by:\s+Ilse Marwood/);
    expect(hrefs(change.html)).toContain(`${PUBLIC_URL}/bookings/${id}`);
    expect(change.attachments).toEqual([]);
  });

  it('an owner editing the texts gets a "changed" message naming what changed, without "changed by"', async () => {
    const created = await book(researcher, { instrumentIds: [tag['PSU-1']], startsAt: at(5, 19), endsAt: at(5, 20) });
    const id: number = created.body.booking.id;
    expect((await researcher.agent.patch(`/api/bookings/${id}`).set('x-csrf-token', researcher.csrf).send({ purpose: 'Bias sweep', notes: 'Bring the 4-wire leads' })).status).toBe(200);
    const change = (await delivered('researcher@lab.test')).at(-1)!;
    expect(change.subject).toMatch(/^Changed: PSU-1, /);
    expect(change.text).toContain('Changed: purpose, notes.');
    expect(change.text).not.toContain('Changed by');
    expect(change.text).toContain(`${PUBLIC_URL}/bookings/${id}`);
  });

  it('a cancellation by a manager reaches the owner with the reason and who cancelled', async () => {
    const created = await book(researcher2, { instrumentIds: [tag['SA-1']], startsAt: at(6, 19), endsAt: at(6, 20) });
    const id: number = created.body.booking.id;
    expect((await post(manager, `/api/bookings/${id}/cancel`, { reason: 'Chuck replacement on bench 1 that evening' })).status).toBe(200);
    const cancel = (await delivered('researcher2@lab.test')).at(-1)!;
    expect(cancel.subject).toMatch(/^Cancelled: SA-1, /);
    expect(cancel.text).toContain('Ilse Marwood, a lab manager, cancelled your booking of SA-1.');
    expect(cancel.text).toContain('Reason given:\n  > Chuck replacement on bench 1 that evening');
    expect(cancel.text).toMatch(/Cancelled by:\s+Ilse Marwood/);
    expect(hrefs(cancel.html)).toContain(`${PUBLIC_URL}/bookings/${id}`);
    expect((await outboxRows('booking-cancelled')).map((r) => r.to_address)).toEqual(['researcher2@lab.test']);
  });

  it('an owner cancelling their own booking is told it was them', async () => {
    const created = await book(researcher2, { instrumentIds: [tag['SA-1']], startsAt: at(6, 21), endsAt: at(6, 22) });
    expect((await post(researcher2, `/api/bookings/${created.body.booking.id}/cancel`, { reason: 'Samples not back from dicing' })).status).toBe(200);
    const cancel = (await delivered('researcher2@lab.test')).at(-1)!;
    expect(cancel.text).toContain('You cancelled your booking of SA-1.');
    expect(cancel.text).toContain('> Samples not back from dicing');
  });
});

describe('no-show released', () => {
  it('tells the owner the booking was not checked in 30 minutes after its start and the rest was released', async () => {
    const start = new Date(Date.now() + 2 * 60_000);
    const end = new Date(start.getTime() + 2 * 3600_000);
    const res = await book(researcher, { instrumentIds: [tag['SG-1']], startsAt: start.toISOString(), endsAt: end.toISOString() });
    expect(res.status).toBe(201);
    const sweep = new Date(start.getTime() + 31 * 60_000);
    expect(await markNoShows(sweep, lab())).toBe(1);

    const released = (await delivered('researcher@lab.test')).at(-1)!;
    expect(released.subject).toMatch(/^Released: SG-1, .*\(not checked in\)$/);
    expect(released.text).toContain('was not checked in 30 minutes after its start, so it is marked as a no-show');
    expect(released.text).toContain(`The rest of the slot, from`);
    expect(released.text).toContain(`${labClock(sweep.toISOString())} (Europe/Berlin`);
    expect(hrefs(released.html)).toContain(`${PUBLIC_URL}/bookings/${res.body.booking.id}`);
    expect((await outboxRows('booking-no-show')).map((r) => r.to_address)).toEqual(['researcher@lab.test']);
  });
});

describe('handover on check-out', () => {
  it('each next booker gets one message with the note, what was left connected, the latest setup and when the bench became free; opting out of booking mail does not stop it', async () => {
    // Sunniva switched booking messages off: no confirmation for her, but the handover still comes.
    await t.db.sequelize.query(`UPDATE users SET notification_settings = '{"bookingUpdates": false}' WHERE email = 'researcher2@lab.test'`);

    const start = new Date(Date.now() + 2 * 60_000);
    const bench = await book(researcher, {
      instrumentIds: [tag['SMU-1'], tag['PSU-1'], tag['OS-1'], tag['SA-1']],
      startsAt: start.toISOString(),
      endsAt: new Date(start.getTime() + 3600_000).toISOString(),
      purpose: 'LNA bias and spectrum',
    });
    expect(bench.status).toBe(201);
    const benchId: number = bench.body.booking.id;
    // Sunniva's next booking holds two of those instruments; her later one is not the next and is not mentioned.
    const next = await book(researcher2, { instrumentIds: [tag['SMU-1'], tag['PSU-1']], startsAt: at(2, 19), endsAt: at(2, 20) });
    const later = await book(researcher2, { instrumentIds: [tag['SMU-1']], startsAt: at(4, 19), endsAt: at(4, 20) });
    // The manager has the next booking of OS-1; the one checking out has the next SA-1 and gets no handover of their own.
    const managers = await book(manager, { instrumentIds: [tag['OS-1']], startsAt: at(2, 21), endsAt: at(2, 22) });
    const own = await book(researcher, { instrumentIds: [tag['SA-1']], startsAt: at(2, 19), endsAt: at(2, 20) });
    for (const r of [next, later, managers, own]) expect(r.status).toBe(201);
    expect((await outboxRows('booking-confirmed')).map((r) => r.to_address).sort()).toEqual(['manager@lab.test', 'researcher@lab.test', 'researcher@lab.test']);

    // Two setups recorded for the bench booking: the one saved last is what stays on the bench.
    const [older] = await query<{ id: number }>(`INSERT INTO setups (booking_id, owner_id, title, updated_at) VALUES (:benchId, :owner, 'First try', now() - interval '1 hour') RETURNING id`, { benchId, owner: researcher.user.id });
    const [latest] = await query<{ id: number }>(`INSERT INTO setups (booking_id, owner_id, title, updated_at) VALUES (:benchId, :owner, 'LNA bias tee, final', now()) RETURNING id`, { benchId, owner: researcher.user.id });

    expect((await post(researcher, `/api/bookings/${benchId}/check-in`)).status).toBe(200);
    const out = await post(researcher, `/api/bookings/${benchId}/check-out`, { handoverNote: 'Probe tips cleaned.\nSMU compliance left at 10 mA.', leftConnected: 'C-011 on SA-1 input, 10 dB pad AT-10A' });
    expect(out.status).toBe(200);
    const freeAt = out.body.booking.checkedOutAt as string;

    const sunniva = await delivered('researcher2@lab.test');
    expect(sunniva).toHaveLength(1);
    const h = sunniva[0]!;
    expect(h.subject).toBe('Handover for PSU-1 + SMU-1: note from Tobiah Renwick');
    expect(h.text).toContain('Hello Sunniva Okoro-Vale,');
    expect(h.text).toContain('Handover note:\n  > Probe tips cleaned.\n  > SMU compliance left at 10 mA.');
    expect(h.text).toContain('Left connected:\n  > C-011 on SA-1 input, 10 dB pad AT-10A');
    expect(h.text).toMatch(new RegExp(`Bench free since:\\s+.*, ${labClock(freeAt)} \\(Europe/Berlin`));
    expect(h.text).toContain(`${labClock(at(2, 19))}–${labClock(at(2, 20))}`);
    const links = hrefs(h.html);
    expect(links).toContain(`${PUBLIC_URL}/setups/${latest!.id}`);
    expect(links).not.toContain(`${PUBLIC_URL}/setups/${older!.id}`);
    expect(links).toContain(`${PUBLIC_URL}/bookings/${next.body.booking.id}`);
    expect(links).not.toContain(`${PUBLIC_URL}/bookings/${later.body.booking.id}`);
    expect(h.text).toContain(`${PUBLIC_URL}/setups/${latest!.id}`);

    const [forManager, ...moreForManager] = (await delivered('manager@lab.test')).filter((m) => m.subject.startsWith('Handover'));
    expect(moreForManager).toHaveLength(0);
    expect(forManager!.subject).toBe('Handover for OS-1: note from Tobiah Renwick');
    expect(hrefs(forManager!.html)).toContain(`${PUBLIC_URL}/bookings/${managers.body.booking.id}`);

    expect((await outboxRows('handover')).map((r) => r.to_address).sort()).toEqual(['manager@lab.test', 'researcher2@lab.test']);
  });

  /** Tobiah's bench booking: from two minutes from now, for an hour (check-in opens at once). */
  async function benchUntilCheckOut(instrument: string) {
    const start = new Date(Date.now() + 2 * 60_000);
    const bench = await book(researcher, { instrumentIds: [tag[instrument]], startsAt: start.toISOString(), endsAt: new Date(start.getTime() + 3600_000).toISOString() });
    expect(bench.status).toBe(201);
    return { id: bench.body.booking.id as number, start };
  }

  it('the note arrives HTML-escaped in the HTML part and verbatim in the text part', async () => {
    const bench = await benchUntilCheckOut('PS-1');
    expect((await book(manager, { instrumentIds: [tag['PS-1']], startsAt: at(1, 19), endsAt: at(1, 20) })).status).toBe(201);
    expect((await post(researcher, `/api/bookings/${bench.id}/check-in`)).status).toBe(200);
    const note = '<script>alert(1)</script> & "quotes"';
    expect((await post(researcher, `/api/bookings/${bench.id}/check-out`, { handoverNote: note, leftConnected: '<b>C-011</b> on port 1' })).status).toBe(200);

    const [h, ...more] = (await delivered('manager@lab.test')).filter((m) => m.subject.startsWith('Handover'));
    expect(more).toHaveLength(0);
    expect(h!.text).toContain(`Handover note:\n  > ${note}\n`);
    expect(h!.text).toContain('Left connected:\n  > <b>C-011</b> on port 1');
    expect(h!.html).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;quotes&quot;');
    expect(h!.html).toContain('&lt;b&gt;C-011&lt;/b&gt; on port 1');
    expect(h!.html).not.toContain('<script');
    expect(h!.html).not.toContain('<b>C-011');
  });

  it('skips a maintenance block to reach the next booking, and the block\'s lab manager gets the handover too', async () => {
    const bench = await benchUntilCheckOut('SG-1');
    // After the bench booking: a maintenance block, then Sunniva's booking, then another block (not next: no handover for it).
    const block = await book(manager, { instrumentIds: [tag['SG-1']], startsAt: new Date(bench.start.getTime() + 2 * 3600_000).toISOString(), endsAt: new Date(bench.start.getTime() + 3 * 3600_000).toISOString(), kind: 'maintenance', purpose: 'Output attenuator check' });
    const next = await book(researcher2, { instrumentIds: [tag['SG-1']], startsAt: at(1, 19), endsAt: at(1, 20) });
    const laterBlock = await book(manager, { instrumentIds: [tag['SG-1']], startsAt: at(1, 21), endsAt: at(1, 22), kind: 'maintenance', purpose: 'Firmware' });
    for (const r of [block, next, laterBlock]) expect(r.status).toBe(201);
    expect((await post(researcher, `/api/bookings/${bench.id}/check-in`)).status).toBe(200);
    expect((await post(researcher, `/api/bookings/${bench.id}/check-out`, { handoverNote: 'Output left off, RF cable on the rack hook.' })).status).toBe(200);

    const [forNext, ...moreForNext] = (await delivered('researcher2@lab.test')).filter((m) => m.subject.startsWith('Handover'));
    expect(moreForNext).toHaveLength(0);
    expect(forNext!.subject).toBe('Handover for SG-1: note from Tobiah Renwick');
    expect(forNext!.text).toMatch(new RegExp(`Your booking:\\s+SG-1, .*${labClock(at(1, 19))}–${labClock(at(1, 20))}`));
    expect(hrefs(forNext!.html)).toContain(`${PUBLIC_URL}/bookings/${next.body.booking.id}`);

    const [forBlock, ...moreForBlock] = (await delivered('manager@lab.test')).filter((m) => m.subject.startsWith('Handover'));
    expect(moreForBlock).toHaveLength(0);
    expect(forBlock!.subject).toBe('Handover for SG-1: note from Tobiah Renwick');
    expect(forBlock!.text).toContain('Your maintenance block on SG-1 is the next work on the bench');
    expect(forBlock!.text).toContain('Output left off, RF cable on the rack hook.');
    expect(forBlock!.text).toMatch(/Your maintenance block:\s+SG-1, /);
    const links = hrefs(forBlock!.html);
    expect(links).toContain(`${PUBLIC_URL}/bookings/${block.body.booking.id}`);
    expect(links).not.toContain(`${PUBLIC_URL}/bookings/${laterBlock.body.booking.id}`);
    expect((await outboxRows('handover')).map((r) => r.to_address).sort()).toEqual(['manager@lab.test', 'researcher2@lab.test']);
  });
});

describe('waitlist offer and POST /api/waitlist/:id/claim', () => {
  const wait = (who: Who, instrument: string, startsAt: string, endsAt: string) => post(who, '/api/waitlist', { instrumentId: tag[instrument], startsAt, endsAt, note: 'Need it for the tape-out check' });

  it('offers a freed slot with a link to the claim page; the claim books it once and refuses a second claim', async () => {
    const taken = await book(researcher, { instrumentIds: [tag['SG-2']], startsAt: at(7, 19), endsAt: at(7, 21) });
    const entry = await wait(researcher2, 'SG-2', at(7, 19), at(7, 21));
    expect(entry.status).toBe(201);
    const entryId: number = entry.body.entry.id;
    // Not offered yet: nothing to claim.
    const early = await post(researcher2, `/api/waitlist/${entryId}/claim`);
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/not been freed yet/);

    expect((await post(researcher, `/api/bookings/${taken.body.booking.id}/cancel`, { reason: 'Moved to next week' })).status).toBe(200);
    const offer = (await delivered('researcher2@lab.test')).at(-1)!;
    expect(offer.subject).toMatch(/^Free now: SG-2, /);
    expect(offer.subject).toContain(`${labClock(at(7, 19))}–${labClock(at(7, 21))} (Europe/Berlin`);
    const claimUrl = `${PUBLIC_URL}/waitlist/${entryId}/claim`;
    expect(hrefs(offer.html)).toContain(claimUrl);
    expect(offer.text).toContain(`Book this slot: ${claimUrl}`);
    expect((await outboxRows('waitlist-offer')).map((r) => r.to_address)).toEqual(['researcher2@lab.test']);

    // Only the person waiting may claim.
    expect((await post(researcher, `/api/waitlist/${entryId}/claim`)).status).toBe(403);

    const claim = await post(researcher2, `/api/waitlist/${entryId}/claim`);
    expect(claim.status).toBe(201);
    expect(claim.body.booking).toMatchObject({ status: 'confirmed', startsAt: at(7, 19), endsAt: at(7, 21), owner: { id: researcher2.user.id }, instruments: [{ tag: 'SG-2' }] });
    const [row] = await query<{ status: string }>('SELECT status FROM waitlist_entries WHERE id = :entryId', { entryId });
    expect(row!.status).toBe('fulfilled');
    // The claimed booking is confirmed like any other.
    expect((await delivered('researcher2@lab.test')).at(-1)!.subject).toMatch(/^Booked: SG-2, /);

    const again = await post(researcher2, `/api/waitlist/${entryId}/claim`);
    expect(again.status).toBe(409);
    expect(again.body.error).toMatchObject({ code: 'invalid_state', message: expect.stringMatching(/already booked this slot/), details: { entryStatus: 'fulfilled' } });
    expect(await query(`SELECT id FROM bookings WHERE owner_id = :owner AND starts_at = :start AND status = 'confirmed'`, { owner: researcher2.user.id, start: at(7, 19) })).toHaveLength(1);
  });

  it('refuses with 409 when someone booked the freed slot first and puts the entry back to waiting; a later freeing offers it again', async () => {
    const taken = await book(manager, { instrumentIds: [tag['OS-1']], startsAt: at(7, 19), endsAt: at(7, 20) });
    const entry = await wait(researcher2, 'OS-1', at(7, 19), at(7, 20));
    const entryId: number = entry.body.entry.id;
    expect((await post(manager, `/api/bookings/${taken.body.booking.id}/cancel`, { reason: 'Not needed' })).status).toBe(200);
    const again = await book(researcher, { instrumentIds: [tag['OS-1']], startsAt: at(7, 19), endsAt: at(7, 20) });
    expect(again.status).toBe(201);

    const claim = await post(researcher2, `/api/waitlist/${entryId}/claim`);
    expect(claim.status).toBe(409);
    expect(claim.body.error).toMatchObject({
      code: 'booking_clash',
      message: 'OS-1 was booked again before you claimed it, so the freed time is no longer free; you stay on the waitlist and get another e-mail when time you are waiting for becomes free again.',
      details: { entryStatus: 'waiting', offered: { startsAt: at(7, 19), endsAt: at(7, 20) } },
    });
    expect(claim.body.error.details.clashes[0]).toMatchObject({ tag: 'OS-1', owner: 'Tobiah Renwick' });
    expect(await query('SELECT status, offered_at, offered_starts_at, offered_ends_at FROM waitlist_entries WHERE id = :entryId', { entryId })).toEqual([
      { status: 'waiting', offered_at: null, offered_starts_at: null, offered_ends_at: null },
    ]);
    const mine = (await researcher2.agent.get('/api/waitlist/mine').expect(200)).body.entries.find((e: { id: number }) => e.id === entryId);
    expect(mine).toMatchObject({ status: 'waiting', offeredAt: null, offeredStartsAt: null, offeredEndsAt: null });
    // The link of the first message now says the slot has not been freed (again) yet.
    expect((await post(researcher2, `/api/waitlist/${entryId}/claim`)).body.error.message).toMatch(/not been freed yet/);

    // The slot frees again: the entry, still first in the queue, is offered it again and the claim books it.
    await t.db.sequelize.query('DELETE FROM outbox');
    expect((await post(researcher, `/api/bookings/${again.body.booking.id}/cancel`, { reason: 'Scope needed elsewhere' })).status).toBe(200);
    expect((await outboxRows('waitlist-offer')).map((r) => r.to_address)).toEqual(['researcher2@lab.test']);
    expect((await delivered('researcher2@lab.test')).at(-1)!.subject).toMatch(/^Free now: OS-1, /);
    const second = await post(researcher2, `/api/waitlist/${entryId}/claim`);
    expect(second.status).toBe(201);
    expect(second.body.booking).toMatchObject({ startsAt: at(7, 19), endsAt: at(7, 20), owner: { id: researcher2.user.id } });
    expect(await query('SELECT status FROM waitlist_entries WHERE id = :entryId', { entryId })).toEqual([{ status: 'fulfilled' }]);
  });

  it('a claim refused by a booking rule (422) also puts the entry back to waiting', async () => {
    const taken = await book(researcher, { instrumentIds: [tag['PSU-1']], startsAt: at(14, 19), endsAt: at(14, 20) });
    const entry = await wait(researcher2, 'PSU-1', at(14, 19), at(14, 20));
    const entryId: number = entry.body.entry.id;
    expect((await post(researcher, `/api/bookings/${taken.body.booking.id}/cancel`, { reason: 'Not needed' })).status).toBe(200);
    await t.db.sequelize.query(`UPDATE instruments SET status = 'maintenance' WHERE tag = 'PSU-1'`);
    try {
      const claim = await post(researcher2, `/api/waitlist/${entryId}/claim`);
      expect(claim.status).toBe(422);
      expect(claim.body.error).toMatchObject({ code: 'booking_rule', details: { entryStatus: 'waiting', issues: [{ rule: 'instrument-unavailable' }] } });
      expect(claim.body.error.message).toBe(
        'PSU-1 is in maintenance and cannot be booked. The freed time was not booked, but you stay on the waitlist and get another e-mail when time you are waiting for becomes free again.',
      );
    } finally {
      await t.db.sequelize.query(`UPDATE instruments SET status = 'in-service' WHERE tag = 'PSU-1'`);
    }
    expect(await query('SELECT status, offered_starts_at FROM waitlist_entries WHERE id = :entryId', { entryId })).toEqual([{ status: 'waiting', offered_starts_at: null }]);
    expect(await query(`SELECT id FROM bookings WHERE owner_id = :owner AND starts_at = :start`, { owner: researcher2.user.id, start: at(14, 19) })).toEqual([]);
  });

  it('offers only the freed part of a longer wait, and the claim books exactly that part', async () => {
    // Sunniva waits for 13–17, when the bench is taken 13–14 and 15–16; only 15–16 is freed.
    const kept = await book(manager, { instrumentIds: [tag['OS-1']], startsAt: at(11, 13), endsAt: at(11, 14) });
    const freed = await book(researcher, { instrumentIds: [tag['OS-1']], startsAt: at(11, 15), endsAt: at(11, 16) });
    for (const r of [kept, freed]) expect(r.status).toBe(201);
    const entry = await wait(researcher2, 'OS-1', at(11, 13), at(11, 17));
    expect(entry.status).toBe(201);
    expect(entry.body.entry).toMatchObject({ status: 'waiting', offeredStartsAt: null, offeredEndsAt: null });
    const entryId: number = entry.body.entry.id;
    expect((await post(researcher, `/api/bookings/${freed.body.booking.id}/cancel`, { reason: 'Probe card late' })).status).toBe(200);

    const mine = (await researcher2.agent.get('/api/waitlist/mine').expect(200)).body.entries.find((e: { id: number }) => e.id === entryId);
    expect(mine).toMatchObject({ status: 'offered', startsAt: at(11, 13), endsAt: at(11, 17), offeredStartsAt: at(11, 15), offeredEndsAt: at(11, 16) });

    const offer = (await delivered('researcher2@lab.test')).at(-1)!;
    expect(offer.subject).toMatch(/^Free now: OS-1, /);
    expect(offer.subject).toContain(`${labClock(at(11, 15))}–${labClock(at(11, 16))} (Europe/Berlin`);
    expect(offer.text).toMatch(new RegExp(`Offered to you:\\s+.*, ${labClock(at(11, 15))}–${labClock(at(11, 16))} \\(Europe/Berlin`));
    expect(offer.text).toMatch(new RegExp(`You wait for:\\s+.*, ${labClock(at(11, 13))}–${labClock(at(11, 17))} \\(Europe/Berlin`));
    expect(offer.text).toContain('Part of the time you are waiting for on OS-1 has become free');

    const claim = await post(researcher2, `/api/waitlist/${entryId}/claim`);
    expect(claim.status).toBe(201);
    expect(claim.body.booking).toMatchObject({ status: 'confirmed', startsAt: at(11, 15), endsAt: at(11, 16), owner: { id: researcher2.user.id } });
    const [row] = await query<{ status: string; offered_starts_at: Date; offered_ends_at: Date }>('SELECT status, offered_starts_at, offered_ends_at FROM waitlist_entries WHERE id = :entryId', { entryId });
    expect([row!.status, row!.offered_starts_at.toISOString(), row!.offered_ends_at.toISOString()]).toEqual(['fulfilled', at(11, 15), at(11, 16)]);
  });

  it('a freed slot that has already begun is offered from now on, never from the past', async () => {
    const start = new Date(Date.now() + 2 * 60_000);
    const end = new Date(start.getTime() + 2 * 3600_000);
    const taken = await book(researcher, { instrumentIds: [tag['SA-1']], startsAt: start.toISOString(), endsAt: end.toISOString() });
    expect(taken.status).toBe(201);
    const entry = await wait(researcher2, 'SA-1', start.toISOString(), end.toISOString());
    const sweep = new Date(start.getTime() + 31 * 60_000);
    expect(await markNoShows(sweep, lab())).toBe(1);
    const [row] = await query<{ status: string; offered_starts_at: Date; offered_ends_at: Date }>('SELECT status, offered_starts_at, offered_ends_at FROM waitlist_entries WHERE id = :id', { id: entry.body.entry.id });
    expect([row!.status, row!.offered_starts_at.toISOString(), row!.offered_ends_at.toISOString()]).toEqual(['offered', sweep.toISOString(), end.toISOString()]);
    // Withdrawn, so that later tests on SA-1 do not offer it anything.
    expect((await researcher2.agent.delete(`/api/waitlist/${entry.body.entry.id}`).set('x-csrf-token', researcher2.csrf)).status).toBe(204);
  });
  it('two claims at once (a double click, two tabs) book the slot once', async () => {
    const taken = await book(researcher, { instrumentIds: [tag['PSU-1']], startsAt: at(10, 19), endsAt: at(10, 20) });
    const entry = await wait(researcher2, 'PSU-1', at(10, 19), at(10, 20));
    expect((await post(researcher, `/api/bookings/${taken.body.booking.id}/cancel`, { reason: 'Not needed' })).status).toBe(200);
    const claims = await Promise.all([post(researcher2, `/api/waitlist/${entry.body.entry.id}/claim`), post(researcher2, `/api/waitlist/${entry.body.entry.id}/claim`)]);
    expect(claims.map((c) => c.status).sort()).toEqual([201, 409]);
    expect(await query(`SELECT id FROM bookings WHERE owner_id = :owner AND starts_at = :start AND status = 'confirmed'`, { owner: researcher2.user.id, start: at(10, 19) })).toHaveLength(1);
    expect((await outboxRows('booking-confirmed')).filter((r) => r.to_address === 'researcher2@lab.test')).toHaveLength(1);
  });

  it('answers a claim of an unknown entry with 404 and a bad id with 400', async () => {
    expect((await post(researcher2, '/api/waitlist/999999/claim')).status).toBe(404);
    expect((await post(researcher2, '/api/waitlist/abc/claim')).status).toBe(400);
  });
});

describe('a moved booking offers only the time it gave up', () => {
  const wait = (who: Who, instrument: string, startsAt: string, endsAt: string) => post(who, '/api/waitlist', { instrumentId: tag[instrument], startsAt, endsAt });
  const patch = (who: Who, id: number, body: object) => who.agent.patch(`/api/bookings/${id}`).set('x-csrf-token', who.csrf).send(body);
  const entryRow = (id: number) =>
    query<{ status: string; from: string | null; to: string | null }>(
      `SELECT status, to_char(offered_starts_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "from",
              to_char(offered_ends_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "to" FROM waitlist_entries WHERE id = :id`,
      { id },
    ).then((rows) => rows[0]);

  it('extending a booking offers nothing; moving its start later offers exactly the part given up', async () => {
    const created = await book(researcher, { instrumentIds: [tag['OS-1']], startsAt: at(13, 19), endsAt: at(13, 20) });
    const entry = await wait(researcher2, 'OS-1', at(13, 19), at(13, 20));
    const entryId: number = entry.body.entry.id;

    // 19–20 → 19–21: the old slot is still covered, so there is nothing to offer.
    expect((await patch(researcher, created.body.booking.id, { endsAt: at(13, 21) })).status).toBe(200);
    expect(await outboxRows('waitlist-offer')).toEqual([]);
    expect(await entryRow(entryId)).toEqual({ status: 'waiting', from: null, to: null });

    // 19–21 → 19:30–21: 19:00–19:30 is given up, and that is what Sunniva is offered.
    expect((await patch(researcher, created.body.booking.id, { startsAt: at(13, 19, 30) })).status).toBe(200);
    expect(await entryRow(entryId)).toEqual({ status: 'offered', from: at(13, 19), to: at(13, 19, 30) });
    const offer = (await delivered('researcher2@lab.test')).find((m) => m.subject.startsWith('Free now'))!;
    expect(offer.subject).toContain(`${labClock(at(13, 19))}–${labClock(at(13, 19, 30))} (Europe/Berlin`);
  });

  it('shrinking a booking to its middle offers both ends, each to whoever waits for it', async () => {
    const created = await book(researcher, { instrumentIds: [tag['SG-1']], startsAt: at(14, 18), endsAt: at(14, 21) });
    const early = await wait(researcher2, 'SG-1', at(14, 18), at(14, 19));
    const late = await wait(manager, 'SG-1', at(14, 20), at(14, 21));
    expect((await patch(researcher, created.body.booking.id, { startsAt: at(14, 19), endsAt: at(14, 20) })).status).toBe(200);
    expect(await entryRow(early.body.entry.id)).toEqual({ status: 'offered', from: at(14, 18), to: at(14, 19) });
    expect(await entryRow(late.body.entry.id)).toEqual({ status: 'offered', from: at(14, 20), to: at(14, 21) });
    expect((await outboxRows('waitlist-offer')).map((r) => r.to_address).sort()).toEqual(['manager@lab.test', 'researcher2@lab.test']);
  });
});

describe('calibration digest (runDailyDigests)', () => {
  // A fixed lab day in winter (Europe/Berlin is UTC+1), with due dates set around it.
  const DAY = '2027-02-10';
  const setDue = async (dues: Record<string, string | null>) => {
    await t.db.sequelize.query(`UPDATE instruments SET calibration_due_on = NULL, status = CASE WHEN status = 'retired' THEN 'in-service' ELSE status END`);
    for (const [instrument, due] of Object.entries(dues)) await t.db.sequelize.query('UPDATE instruments SET calibration_due_on = :due WHERE tag = :instrument', { replacements: { due, instrument } });
  };

  it('from 07:00 lab time, once per lab day, sends each manager the overdue and soon-due instruments with links', async () => {
    await setDue({ 'SG-3': '2027-02-01', 'SMU-1': '2027-02-19', 'SA-2': '2027-02-24', 'SG-2': '2027-02-25', 'NA-1': '2027-02-05', 'OS-1': '2027-02-10' });
    await t.db.sequelize.query(`UPDATE instruments SET status = 'retired' WHERE tag = 'NA-1'`);

    expect(await runDailyDigests(new Date(`${DAY}T05:59:00Z`), lab())).toBe(0);
    expect(await query('SELECT * FROM mail_digests')).toEqual([]);

    // Two server instances at 07:00 on the dot: one message in all.
    const runs = await Promise.all([runDailyDigests(new Date(`${DAY}T06:00:00Z`), lab()), runDailyDigests(new Date(`${DAY}T06:00:00Z`), lab())]);
    expect(runs.sort()).toEqual([0, 1]);
    expect(await runDailyDigests(new Date(`${DAY}T16:00:00Z`), lab())).toBe(0);
    expect(await query(`SELECT kind, to_char(lab_date, 'YYYY-MM-DD') AS day FROM mail_digests`)).toEqual([{ kind: 'calibration-digest', day: DAY }]);

    const [digest, ...more] = await delivered('manager@lab.test');
    expect(more).toHaveLength(0);
    expect(digest!.subject).toBe(`Calibration: 1 overdue, 3 due within 14 days (${DAY})`);
    expect(digest!.text).toContain('overdue since 2027-02-01 (9 days)');
    expect(digest!.text).toContain('due today, 2027-02-10');
    expect(digest!.text).toContain('due 2027-02-19 (in 9 days)');
    expect(digest!.text).toContain('due 2027-02-24 (in 14 days)');
    // Outside the window, and retired: not listed.
    expect(digest!.text).not.toContain('SG-2');
    expect(digest!.text).not.toContain('NA-1');
    const links = hrefs(digest!.html);
    for (const instrument of ['SG-3', 'SMU-1', 'SA-2', 'OS-1']) expect(links).toContain(`${PUBLIC_URL}/instruments/${tag[instrument]}`);
    expect(links).not.toContain(`${PUBLIC_URL}/instruments/${tag['SG-2']}`);
    expect((await outboxRows('calibration-digest')).map((r) => r.to_address)).toEqual(['manager@lab.test']);
  });

  it('sends nothing to a manager who switched it off, nor on a day with nothing to report', async () => {
    await setDue({ 'SG-3': '2027-02-01' });
    await t.db.sequelize.query(`UPDATE users SET notification_settings = '{"calibrationDigest": false}' WHERE email = 'manager@lab.test'`);
    expect(await runDailyDigests(new Date('2027-02-11T07:00:00Z'), lab())).toBe(0);
    await t.db.sequelize.query(`UPDATE users SET notification_settings = '{}'`);
    await setDue({ 'SG-3': '2027-03-30' });
    expect(await runDailyDigests(new Date('2027-02-12T07:00:00Z'), lab())).toBe(0);
    expect(await outboxRows()).toEqual([]);
    // A day with something due again sends again.
    await setDue({ 'SG-3': '2027-02-20' });
    expect(await runDailyDigests(new Date('2027-02-13T07:00:00Z'), lab())).toBe(1);
    expect((await delivered('manager@lab.test')).map((m) => m.subject)).toEqual(['Calibration: 1 due within 14 days (2027-02-13)']);
  });
});
