import { createHash } from 'node:crypto';
import ICAL from 'ical.js';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { agentWithCsrf, signIn, startTestApp, type TestApp } from '../support/test-app.js';

// RFC 5545 (https://datatracker.ietf.org/doc/rfc5545/) is the source of every format check below; each names its section.

/** Feeds are fetched with the clock pinned here, so the 30-days-back / 180-days-ahead window holds the fixed dates below. */
const NOW = new Date('2026-12-01T12:00:00Z');
/** A comma in the lab name proves the calendar name is escaped as TEXT (RFC 5545 §3.3.11). */
const LAB_NAME = 'Kestrel Vale, Microwave Circuits Lab';

let t: TestApp;
let researcher: Awaited<ReturnType<typeof signIn>>;
let researcher2: Awaited<ReturnType<typeof signIn>>;
let manager: Awaited<ReturnType<typeof signIn>>;
let visitor: Awaited<ReturnType<typeof signIn>>;
const instrument: Record<string, { id: number; location: string }> = {};
const booking: Record<string, number> = {};

const query = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
  t.db.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });

interface NewBooking {
  ownerId: number;
  tags: string[];
  startsAt: string;
  endsAt: string;
  purpose: string;
  kind?: 'booking' | 'maintenance';
  status?: 'confirmed' | 'checked-in' | 'completed' | 'cancelled' | 'no-show';
  projectCode?: string;
}

/** A booking as the bookings feature stores it: one bookings row, one booking_instruments row per instrument. */
async function insertBooking(b: NewBooking): Promise<number> {
  const status = b.status ?? 'confirmed';
  const [row] = await query<{ id: number }>(
    `INSERT INTO bookings (kind, status, owner_id, starts_at, ends_at, purpose, project_code)
     VALUES (:kind, :status, :ownerId, :startsAt, :endsAt, :purpose, :projectCode) RETURNING id`,
    { kind: b.kind ?? 'booking', status, ownerId: b.ownerId, startsAt: b.startsAt, endsAt: b.endsAt, purpose: b.purpose, projectCode: b.projectCode ?? '' },
  );
  for (const tag of b.tags) {
    // Cancelled and no-show bookings have released their slot.
    await query(
      `INSERT INTO booking_instruments (booking_id, instrument_id, starts_at, ends_at, blocked_until, active)
       VALUES (:bookingId, :instrumentId, :startsAt, :endsAt, :endsAt, :active)`,
      { bookingId: row!.id, instrumentId: instrument[tag]!.id, startsAt: b.startsAt, endsAt: b.endsAt, active: status !== 'cancelled' && status !== 'no-show' },
    );
  }
  return row!.id;
}

beforeAll(async () => {
  t = await startTestApp({ LAB_NAME });
  [researcher, researcher2, manager, visitor] = await Promise.all([
    signIn(t.app, 'researcher@lab.test'),
    signIn(t.app, 'researcher2@lab.test'),
    signIn(t.app, 'manager@lab.test'),
    signIn(t.app, 'visitor@lab.test'),
  ]);
  for (const row of await query<{ id: number; tag: string; location: string }>(`SELECT id, tag, location FROM instruments WHERE tag IN ('PS-1', 'SG-1', 'SA-1')`)) {
    instrument[row.tag] = { id: row.id, location: row.location };
  }
  // Exactly the bookings below, whatever the demo seed holds: the feeds are checked event by event.
  await query('DELETE FROM bookings');
  const r1 = researcher.user.id;
  booking.afternoon = await insertBooking({ ownerId: r1, tags: ['PS-1', 'SG-1'], startsAt: '2026-12-03T13:00:00Z', endsAt: '2026-12-03T17:00:00Z', purpose: 'Probe-station afternoon', projectCode: 'RX-7' });
  booking.cancelled = await insertBooking({ ownerId: r1, tags: ['PS-1'], startsAt: '2026-12-04T09:00:00Z', endsAt: '2026-12-04T11:00:00Z', purpose: 'Cancelled wafer check', status: 'cancelled' });
  // Across Europe/Berlin's spring-forward on 2027-03-28 (01:00 UTC): 00:30+01:00 to 04:30+02:00 is 3 h, not 4.
  booking.dst = await insertBooking({
    ownerId: r1,
    tags: ['SA-1'],
    startsAt: '2027-03-28T00:30:00+01:00',
    endsAt: '2027-03-28T04:30:00+02:00',
    // Long and full of multi-octet characters, so SUMMARY and DESCRIPTION must be folded.
    purpose: 'Overnight phase-noise run on the 28 GHz LO chain — µ-wave probes at −20 dBm, 50 Ω loads, Δf sweep 10 Hz–1 MHz; do not touch, the pads are live',
  });
  booking.missed = await insertBooking({ ownerId: r1, tags: ['PS-1'], startsAt: '2026-11-20T09:00:00Z', endsAt: '2026-11-20T10:00:00Z', purpose: 'Missed slot', status: 'no-show' });
  // Starts before the window opens (2026-11-01T12:00Z) but ends inside it.
  booking.overlapping = await insertBooking({ ownerId: r1, tags: ['SG-1'], startsAt: '2026-10-31T20:00:00Z', endsAt: '2026-11-01T14:00:00Z', purpose: 'Long LO soak' });
  booking.tooOld = await insertBooking({ ownerId: r1, tags: ['SG-1'], startsAt: '2026-10-15T09:00:00Z', endsAt: '2026-10-15T10:00:00Z', purpose: 'Too old' });
  booking.tooFar = await insertBooking({ ownerId: r1, tags: ['PS-1'], startsAt: '2027-07-01T09:00:00Z', endsAt: '2027-07-01T10:00:00Z', purpose: 'Too far ahead' });
  booking.other = await insertBooking({ ownerId: researcher2.user.id, tags: ['PS-1'], startsAt: '2026-12-05T09:00:00Z', endsAt: '2026-12-05T12:00:00Z', purpose: 'Wafer map of lot 12', projectCode: 'LOT-12' });
  booking.maintenance = await insertBooking({ ownerId: manager.user.id, tags: ['PS-1'], kind: 'maintenance', startsAt: '2026-12-07T08:00:00Z', endsAt: '2026-12-07T12:00:00Z', purpose: 'Chuck cleaning' });
});
afterAll(() => t.close());

type Agent = Awaited<ReturnType<typeof signIn>>;

const createFeed = (who: Agent, body: object) => who.agent.post('/api/feeds').set('x-csrf-token', who.csrf).send(body);

/** Fetch a feed the way a calendar app does: no cookies, raw bytes, clock pinned to NOW. */
async function fetchFeed(url: string) {
  vi.useFakeTimers({ now: NOW, toFake: ['Date'] });
  try {
    return await request(t.app)
      .get(new URL(url).pathname)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });
  } finally {
    vi.useRealTimers();
  }
}

/** The feed's bytes, with the format checks every feed must pass; returns the parsed calendar and its events by booking id. */
function checkFeed(bytes: Buffer) {
  // RFC 5545 §3.1: content lines are delimited by CRLF, and §3.4: the object itself ends "END:VCALENDAR" CRLF.
  const text = bytes.toString('utf8');
  expect(text.endsWith('END:VCALENDAR\r\n')).toBe(true);
  const lines = text.split('\r\n');
  expect(lines.pop()).toBe('');
  for (const line of lines) {
    // §3.1: no bare CR or LF inside a line (a line break in a value is written "\n", §3.3.11).
    expect(line).not.toMatch(/[\r\n]/);
    // §3.1: lines SHOULD NOT be longer than 75 octets, excluding the line break; octets, not characters.
    expect(Buffer.byteLength(line, 'utf8'), line).toBeLessThanOrEqual(75);
  }
  // §3.1: folding must not split a multi-octet UTF-8 sequence, so each physical line decodes on its own.
  const decoder = new TextDecoder('utf-8', { fatal: true });
  let start = 0;
  for (let i = bytes.indexOf('\r\n'); i !== -1; i = bytes.indexOf('\r\n', start)) {
    expect(() => decoder.decode(bytes.subarray(start, i))).not.toThrow();
    start = i + 2;
  }

  const calendar = new ICAL.Component(ICAL.parse(text));
  expect(calendar.name).toBe('vcalendar');
  // §3.6 / §3.7.3 / §3.7.4: PRODID and VERSION:2.0 are required, once each.
  expect(calendar.getAllProperties('prodid')).toHaveLength(1);
  expect(calendar.getAllProperties('version').map((p) => p.getFirstValue())).toEqual(['2.0']);

  const events = new Map<number, ICAL.Component>();
  for (const vevent of calendar.getAllSubcomponents('vevent')) {
    // §3.6.1: UID and DTSTAMP are required, once each; §3.8.7.2: DTSTAMP is UTC.
    expect(vevent.getAllProperties('uid')).toHaveLength(1);
    expect(vevent.getAllProperties('dtstamp')).toHaveLength(1);
    expect(vevent.getFirstProperty('dtstamp')!.toICALString()).toMatch(/^DTSTAMP:\d{8}T\d{6}Z$/);
    // §3.6.1: DTSTART is required without METHOD; DTEND and DURATION never both. §3.3.5 form #2: UTC with Z, no TZID.
    expect(vevent.getFirstProperty('dtstart')!.toICALString()).toMatch(/^DTSTART:\d{8}T\d{6}Z$/);
    expect(vevent.getFirstProperty('dtend')!.toICALString()).toMatch(/^DTEND:\d{8}T\d{6}Z$/);
    expect(vevent.getFirstProperty('duration')).toBeNull();
    const uid = String(vevent.getFirstPropertyValue('uid'));
    const id = Number(/^booking-(\d+)@127\.0\.0\.1:3000$/.exec(uid)?.[1]);
    expect(id, uid).toBeGreaterThan(0);
    events.set(id, vevent);
  }
  return { calendar, events, text };
}

/**
 * X-WR-CALNAME is an x-prop, TEXT by default (RFC 5545 §3.8.8.2), which ical.js leaves escaped: undo §3.3.11 here.
 * (ical.js unescapes the TEXT properties it knows, such as SUMMARY and DESCRIPTION.)
 */
const calendarName = (calendar: ICAL.Component) => {
  const raw = String(calendar.getFirstPropertyValue('x-wr-calname'));
  expect(raw).not.toMatch(/(^|[^\\])[,;]/);
  return raw.replace(/\\([\\;,nN])/g, (_, c: string) => (c.toLowerCase() === 'n' ? '\n' : c));
};
const value = (vevent: ICAL.Component, name: string) => String(vevent.getFirstPropertyValue(name));
const instant = (vevent: ICAL.Component, name: 'dtstart' | 'dtend') => (vevent.getFirstPropertyValue(name) as ICAL.Time).toJSDate().toISOString();
const sorted = (ids: number[]) => [...ids].sort((a, b) => a - b);

describe('POST /api/feeds and the person feed', () => {
  it('gives a secret URL once, stores only its SHA-256, and the feed holds exactly the owner’s bookings in the window', async () => {
    const res = await createFeed(researcher, { scope: 'person' });
    expect(res.status).toBe(201);
    expect(res.body.feed).toMatchObject({ scope: 'person', instrumentId: null, instrumentTag: null, createdAt: expect.any(String) });
    const url: string = res.body.feed.url;
    const token = /^http:\/\/127\.0\.0\.1:3000\/api\/feeds\/([A-Za-z0-9_-]{43})\.ics$/.exec(url)?.[1];
    expect(token).toBeDefined();
    const rows = await query<{ token_hash: string }>(`SELECT token_hash FROM calendar_feeds WHERE user_id = :userId AND scope = 'person'`, { userId: researcher.user.id });
    expect(rows).toEqual([{ token_hash: createHash('sha256').update(token!).digest('hex') }]);

    const feed = await fetchFeed(url);
    expect(feed.status).toBe(200);
    // RFC 5545 §8.1 registers text/calendar; §3.1.4: the charset is UTF-8. The cache policy is Skewbench's (only the token holder may keep it).
    expect(feed.headers['content-type']).toBe('text/calendar; charset=utf-8');
    expect(feed.headers['cache-control']).toBe('private, max-age=300');
    // Fetched without a session, and none is started for the calendar app.
    expect(feed.headers['set-cookie']).toBeUndefined();

    const { calendar, events, text } = checkFeed(feed.body as Buffer);
    // §3.1: the long lines were folded (CRLF plus one space), so the checks above saw continuation lines.
    expect(text).toMatch(/\r\n [^\r\n]/);
    // §3.3.11: the comma is escaped and reads back as a comma.
    expect(calendarName(calendar)).toBe(`My bench bookings · ${LAB_NAME}`);
    // Cancelled, too old, too far ahead and another person's booking are absent; the no-show stays in the owner's own feed.
    expect(sorted([...events.keys()])).toEqual(sorted([booking.afternoon!, booking.dst!, booking.missed!, booking.overlapping!]));

    const afternoon = events.get(booking.afternoon!)!;
    expect(value(afternoon, 'summary')).toBe('PS-1 + SG-1 · Probe-station afternoon');
    expect(instant(afternoon, 'dtstart')).toBe('2026-12-03T13:00:00.000Z');
    expect(instant(afternoon, 'dtend')).toBe('2026-12-03T17:00:00.000Z');
    expect(value(afternoon, 'location')).toBe([instrument['PS-1']!.location, instrument['SG-1']!.location].sort().join('; '));
    expect(value(afternoon, 'url')).toBe(`http://127.0.0.1:3000/bookings/${booking.afternoon}`);
    expect(value(afternoon, 'description')).toBe(`Probe-station afternoon\nProject RX-7\nDetails: http://127.0.0.1:3000/bookings/${booking.afternoon}`);

    // The DST booking: 00:30+01:00 is 23:30Z the day before, 04:30+02:00 is 02:30Z (§3.3.5 form #2); 3 h long.
    const dst = events.get(booking.dst!)!;
    expect(instant(dst, 'dtstart')).toBe('2027-03-27T23:30:00.000Z');
    expect(instant(dst, 'dtend')).toBe('2027-03-28T02:30:00.000Z');
    expect(dst.getFirstProperty('dtstart')!.toICALString()).toBe('DTSTART:20270327T233000Z');
    expect(dst.getFirstProperty('dtend')!.toICALString()).toBe('DTEND:20270328T023000Z');
    expect(Date.parse(instant(dst, 'dtend')) - Date.parse(instant(dst, 'dtstart'))).toBe(3 * 3_600_000);
    // §3.1: unfolding the folded lines gives back the value exactly, multi-octet characters included.
    expect(value(dst, 'summary')).toBe(
      'SA-1 · Overnight phase-noise run on the 28 GHz LO chain — µ-wave probes at −20 dBm, 50 Ω loads, Δf sweep 10 Hz–1 MHz; do not touch, the pads are live',
    );
  });

  it('keeps UID and DTSTAMP stable from one fetch to the next (RFC 5545 §3.8.4.7, §3.8.7.2)', async () => {
    const url = (await createFeed(researcher2, { scope: 'person' })).body.feed.url;
    const stamps = async () => {
      const { events } = checkFeed((await fetchFeed(url)).body as Buffer);
      return [...events.values()].map((e) => `${value(e, 'uid')} ${e.getFirstProperty('dtstamp')!.toICALString()}`);
    };
    const first = await stamps();
    expect(first).toHaveLength(1);
    expect(await stamps()).toEqual(first);
  });

  it('regenerating replaces the token: the old URL is 404 at once, the new one works, one row remains', async () => {
    const first = (await createFeed(manager, { scope: 'person' })).body.feed.url as string;
    expect((await fetchFeed(first)).status).toBe(200);
    const again = await createFeed(manager, { scope: 'person' });
    expect(again.status).toBe(201);
    const second = again.body.feed.url as string;
    expect(second).not.toBe(first);

    const old = await request(t.app).get(new URL(first).pathname);
    expect(old.status).toBe(404);
    expect(old.body.error).toMatchObject({ code: 'not_found', message: expect.any(String) });
    const fresh = await fetchFeed(second);
    expect(fresh.status).toBe(200);
    // The manager's own maintenance block, with the maintenance summary.
    const { events } = checkFeed(fresh.body as Buffer);
    expect([...events.keys()]).toEqual([booking.maintenance]);
    expect(value(events.get(booking.maintenance!)!, 'summary')).toBe('Maintenance: PS-1');
    const rows = await query<{ n: string }>(`SELECT count(*) AS n FROM calendar_feeds WHERE user_id = :userId AND scope = 'person'`, { userId: manager.user.id });
    expect(rows[0]!.n).toBe('1');
  });
});

describe('instrument feeds', () => {
  it('hold the instrument’s bookings and maintenance, not cancelled and not no-show, with who booked for a researcher', async () => {
    const res = await createFeed(researcher, { scope: 'instrument', instrumentId: instrument['PS-1']!.id });
    expect(res.status).toBe(201);
    expect(res.body.feed).toMatchObject({ scope: 'instrument', instrumentId: instrument['PS-1']!.id, instrumentTag: 'PS-1' });
    const { calendar, events } = checkFeed((await fetchFeed(res.body.feed.url)).body as Buffer);
    expect(calendarName(calendar)).toBe(`PS-1 · ${LAB_NAME}`);
    expect(sorted([...events.keys()])).toEqual(sorted([booking.afternoon!, booking.other!, booking.maintenance!]));
    // The same UID as in the person feed: one booking is one event wherever it appears (§3.8.4.7).
    expect(value(events.get(booking.afternoon!)!, 'uid')).toBe(`booking-${booking.afternoon}@127.0.0.1:3000`);
    expect(value(events.get(booking.afternoon!)!, 'summary')).toBe('PS-1 + SG-1 · Probe-station afternoon');
    const other = events.get(booking.other!)!;
    expect(value(other, 'summary')).toBe('PS-1 · Wafer map of lot 12');
    expect(value(other, 'description')).toContain('Booked by Sunniva Okoro-Vale');
    expect(value(events.get(booking.maintenance!)!, 'summary')).toBe('Maintenance: PS-1');
  });

  it('a visitor’s feed shows instruments and times only, never who booked or why', async () => {
    const res = await createFeed(visitor, { scope: 'instrument', instrumentId: instrument['PS-1']!.id });
    expect(res.status).toBe(201);
    const { events, text } = checkFeed((await fetchFeed(res.body.feed.url)).body as Buffer);
    expect(sorted([...events.keys()])).toEqual(sorted([booking.afternoon!, booking.other!, booking.maintenance!]));
    expect(value(events.get(booking.afternoon!)!, 'summary')).toBe('PS-1 + SG-1 booked');
    expect(value(events.get(booking.other!)!, 'summary')).toBe('PS-1 booked');
    expect(value(events.get(booking.maintenance!)!, 'summary')).toBe('Maintenance: PS-1');
    expect(instant(events.get(booking.other!)!, 'dtstart')).toBe('2026-12-05T09:00:00.000Z');
    // Checked on the unfolded text, so a name split across a fold cannot slip through.
    const unfolded = text.replace(/\r\n[ \t]/g, '');
    for (const secret of ['Tobiah Renwick', 'Sunniva Okoro-Vale', 'Ilse Marwood', 'Probe-station afternoon', 'Wafer map', 'Chuck cleaning', 'RX-7', 'LOT-12']) {
      expect(unfolded).not.toContain(secret);
    }
  });

  it('answers 404 for an unknown instrument and 400 for a bad body, storing nothing', async () => {
    const unknown = await createFeed(researcher, { scope: 'instrument', instrumentId: 999999 });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.code).toBe('not_found');
    const missing = await createFeed(researcher, { scope: 'instrument' });
    expect(missing.status).toBe(400);
    expect(missing.body.error.details.map((d: { path: string }) => d.path)).toEqual(['instrumentId']);
    // JSON carries numbers as numbers: a string id is refused, not coerced.
    expect((await createFeed(researcher, { scope: 'instrument', instrumentId: String(instrument['PS-1']!.id) })).status).toBe(400);
    const badScope = await createFeed(researcher, { scope: 'everything' });
    expect(badScope.status).toBe(400);
    expect(badScope.body.error.code).toBe('validation_failed');
    const huge = await createFeed(researcher, { scope: 'instrument', instrumentId: 1e12 });
    expect(huge.status).toBe(400);
    const rows = await query<{ n: string }>('SELECT count(*) AS n FROM calendar_feeds WHERE instrument_id = 999999');
    expect(rows[0]!.n).toBe('0');
  });
});

describe('GET /api/feeds and DELETE', () => {
  it('lists the caller’s feeds without URLs, and revoking makes the URL 404', async () => {
    const person = (await createFeed(researcher, { scope: 'person' })).body.feed.url as string;
    const sg1 = (await createFeed(researcher, { scope: 'instrument', instrumentId: instrument['SG-1']!.id })).body.feed.url as string;
    const list = await researcher.agent.get('/api/feeds').expect(200);
    expect(list.body.feeds).toEqual([
      { scope: 'person', instrumentId: null, instrumentTag: null, createdAt: expect.any(String), url: null },
      { scope: 'instrument', instrumentId: instrument['PS-1']!.id, instrumentTag: 'PS-1', createdAt: expect.any(String), url: null },
      { scope: 'instrument', instrumentId: instrument['SG-1']!.id, instrumentTag: 'SG-1', createdAt: expect.any(String), url: null },
    ]);

    await researcher.agent.delete('/api/feeds/person').set('x-csrf-token', researcher.csrf).expect(204);
    expect((await request(t.app).get(new URL(person).pathname)).status).toBe(404);
    await researcher.agent.delete(`/api/feeds/instrument/${instrument['SG-1']!.id}`).set('x-csrf-token', researcher.csrf).expect(204);
    expect((await request(t.app).get(new URL(sg1).pathname)).status).toBe(404);
    expect((await researcher.agent.get('/api/feeds')).body.feeds.map((f: { instrumentTag: string | null }) => f.instrumentTag)).toEqual(['PS-1']);

    const again = await researcher.agent.delete('/api/feeds/person').set('x-csrf-token', researcher.csrf);
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe('not_found');
    const badScope = await researcher.agent.delete('/api/feeds/everything').set('x-csrf-token', researcher.csrf);
    expect(badScope.status).toBe(400);
    expect(badScope.body.error.details[0].path).toBe('params.scope');
  });

  it('another person’s feeds are neither listed nor revocable', async () => {
    expect((await researcher2.agent.get('/api/feeds')).body.feeds.map((f: { scope: string }) => f.scope)).toEqual(['person']);
    const res = await researcher2.agent.delete(`/api/feeds/instrument/${instrument['PS-1']!.id}`).set('x-csrf-token', researcher2.csrf);
    expect(res.status).toBe(404);
    expect((await researcher.agent.get('/api/feeds')).body.feeds).toHaveLength(1);
  });
});

describe('access', () => {
  it('an unknown or malformed token is a JSON 404', async () => {
    for (const path of [`/api/feeds/${'A'.repeat(43)}.ics`, '/api/feeds/short.ics', `/api/feeds/${'%00'.repeat(20)}.ics`]) {
      const res = await request(t.app).get(path);
      expect(res.status, path).toBe(404);
      expect(res.body.error).toMatchObject({ code: 'not_found', message: expect.any(String) });
    }
  });

  it('managing feeds needs a session: 401 signed out (with a valid CSRF token), 403 without one', async () => {
    const { agent, csrf } = await agentWithCsrf(t.app);
    const res = await agent.post('/api/feeds').set('x-csrf-token', csrf).send({ scope: 'person' });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
    expect((await agent.get('/api/feeds')).status).toBe(401);
    expect((await agent.delete('/api/feeds/person').set('x-csrf-token', csrf)).status).toBe(401);
    const noCsrf = await researcher.agent.post('/api/feeds').send({ scope: 'person' });
    expect(noCsrf.status).toBe(403);
    expect(noCsrf.body.error.code).toBe('csrf_invalid');
  });

  it('a deactivated owner’s feed stops answering', async () => {
    const url = (await createFeed(researcher2, { scope: 'instrument', instrumentId: instrument['SA-1']!.id })).body.feed.url as string;
    expect((await fetchFeed(url)).status).toBe(200);
    await query('UPDATE users SET active = false WHERE id = :id', { id: researcher2.user.id });
    expect((await request(t.app).get(new URL(url).pathname)).status).toBe(404);
  });
});
