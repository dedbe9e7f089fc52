import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { markNoShows } from '../../server/features/bookings/bookings.service.js';
import { signIn, startTestApp, type TestApp } from '../support/test-app.js';
import { at } from '../support/time.js';

let t: TestApp;
let manager: Awaited<ReturnType<typeof signIn>>;
let researcher: Awaited<ReturnType<typeof signIn>>;
let researcher2: Awaited<ReturnType<typeof signIn>>;
let visitor: Awaited<ReturnType<typeof signIn>>;
const tag: Record<string, number> = {};

beforeAll(async () => {
  t = await startTestApp();
  [manager, researcher, researcher2, visitor] = await Promise.all([
    signIn(t.app, 'manager@lab.test'),
    signIn(t.app, 'researcher@lab.test'),
    signIn(t.app, 'researcher2@lab.test'),
    signIn(t.app, 'visitor@lab.test'),
  ]);
  for (const i of (await visitor.agent.get('/api/instruments')).body.instruments) tag[i.tag] = i.id;
  // These tests book slots relative to the moment they run; the demo's bookings would collide at some hours.
  await t.db.sequelize.query('DELETE FROM waitlist_entries; DELETE FROM bookings;');
});
afterAll(() => t.close());


type Who = Awaited<ReturnType<typeof signIn>>;
const book = (who: Who, body: Record<string, unknown>) => who.agent.post('/api/bookings').set('x-csrf-token', who.csrf).send({ purpose: 'Measurement', ...body });
const activeOverlaps = async () =>
  Number(
    (await t.db.sequelize.query<{ n: string }>(
      `SELECT count(*) AS n FROM booking_instruments a JOIN booking_instruments b
         ON a.instrument_id = b.instrument_id AND a.booking_id < b.booking_id AND a.active AND b.active
        AND tstzrange(a.starts_at, a.ends_at) && tstzrange(b.starts_at, b.ends_at)`,
      { type: QueryTypes.SELECT },
    ))[0]!.n,
  );

describe('POST /api/bookings', () => {
  it('books several instruments together and reads them back in the range query', async () => {
    const res = await book(researcher, { instrumentIds: [tag['PS-2'], tag['SG-1'], tag['SA-1']], startsAt: at(3, 19), endsAt: at(3, 22), projectCode: 'TTD-2' });
    expect(res.status).toBe(201);
    expect(res.body.booking.instruments.map((i: { tag: string }) => i.tag)).toEqual(['PS-2', 'SA-1', 'SG-1']);
    expect(res.body.booking).toMatchObject({ status: 'confirmed', kind: 'booking', projectCode: 'TTD-2', owner: { name: 'Tobiah Renwick' }, canChange: true });
    const list = await researcher.agent.get(`/api/bookings?from=${encodeURIComponent(at(3, 0))}&to=${encodeURIComponent(at(4, 0))}&instrumentId=${tag['SA-1']}`).expect(200);
    expect(list.body.bookings.map((b: { id: number }) => b.id)).toContain(res.body.booking.id);
  });

  it('shows visitors instrument and time only, and does not let them book', async () => {
    const list = await visitor.agent.get(`/api/bookings?from=${encodeURIComponent(at(3, 0))}&to=${encodeURIComponent(at(4, 0))}`).expect(200);
    const b = list.body.bookings[0];
    expect(b.instruments.length).toBeGreaterThan(0);
    expect(b).toMatchObject({ owner: null, purpose: null, projectCode: null, canChange: false });
    const res = await book(visitor, { instrumentIds: [tag['SG-2']], startsAt: at(5, 19), endsAt: at(5, 20) });
    expect(res.status).toBe(403);
  });

  it('refuses a clash with 409 naming the slot and who holds it', async () => {
    const res = await book(researcher2, { instrumentIds: [tag['SG-1']], startsAt: at(3, 20), endsAt: at(3, 21) });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('booking_clash');
    expect(res.body.error.details.clashes[0]).toMatchObject({ tag: 'SG-1', owner: 'Tobiah Renwick', startsAt: at(3, 19).replace(/\.\d+Z$/, '.000Z') });
  });

  it('a bench booking where one instrument clashes books none of them', async () => {
    const before = Number((await t.db.sequelize.query<{ n: string }>('SELECT count(*) AS n FROM bookings', { type: QueryTypes.SELECT }))[0]!.n);
    const res = await book(researcher2, { instrumentIds: [tag['SG-2'], tag['OS-1'], tag['SA-1']], startsAt: at(3, 21), endsAt: at(3, 23) });
    expect(res.status).toBe(409);
    expect(res.body.error.details.clashes.map((c: { tag: string }) => c.tag)).toEqual(['SA-1']);
    const after = Number((await t.db.sequelize.query<{ n: string }>('SELECT count(*) AS n FROM bookings', { type: QueryTypes.SELECT }))[0]!.n);
    expect(after).toBe(before);
  });

  it('50 simultaneous requests for overlapping slots of one instrument give exactly one 201 and 49 × 409', async () => {
    const requests = Array.from({ length: 50 }, (_, n) => book(n % 2 ? researcher : researcher2, { instrumentIds: [tag['SG-2']], startsAt: at(6, 19, n % 30), endsAt: at(6, 21, n % 20) }));
    const statuses = (await Promise.all(requests)).map((r) => r.status);
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(49);
    expect(await activeOverlaps()).toBe(0);
  });

  it('keeps a booking across the daylight-saving change at its real length', async () => {
    // Europe/Berlin leaves CET (+01:00) for CEST (+02:00) on the last Sunday of March (EU Directive 2000/84/EC).
    const res = await book(manager, { instrumentIds: [tag['PSU-1']], startsAt: '2027-03-28T00:30:00+01:00', endsAt: '2027-03-28T04:30:00+02:00', kind: 'maintenance' });
    expect(res.status).toBe(201);
    expect(res.body.booking.startsAt).toBe('2027-03-27T23:30:00.000Z');
    expect(res.body.booking.endsAt).toBe('2027-03-28T02:30:00.000Z');
    expect(Date.parse(res.body.booking.endsAt) - Date.parse(res.body.booking.startsAt)).toBe(3 * 3600_000);
  });

  it('answers bad input with 400 and field paths', async () => {
    const res = await book(researcher, { instrumentIds: [], startsAt: 'tomorrow', endsAt: at(3, 1), purpose: '' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['instrumentIds', 'purpose', 'startsAt']);
    const reversed = await book(researcher, { instrumentIds: [tag['SG-1']], startsAt: at(3, 5), endsAt: at(3, 4) });
    expect(reversed.body.error.details[0].path).toBe('endsAt');
    const bad = await researcher.agent.get('/api/bookings?from=2026-01-01&to=x');
    expect(bad.status).toBe(400);
  });
});

describe('booking rules (422 booking_rule, one message each)', () => {
  const ruleOf = (res: request.Response) => res.body.error.details.issues.map((i: { rule: string }) => i.rule);

  it.each([
    ['an instrument in maintenance', 'SA-2', () => [at(4, 19), at(4, 20)], 'instrument-unavailable', /in maintenance/],
    ['an overdue calibration', 'SG-3', () => [at(4, 19), at(4, 20)], 'calibration-overdue', /calibration is due/],
    ['longer than the longest booking', 'PS-1', () => [at(4, 10), at(4, 19)], 'too-long', /at most 8 h/],
    ['beyond the advance window', 'PS-1', () => [at(40, 19), at(40, 20)], 'beyond-window', /28 days ahead/],
    ['starting in the past', 'SG-1', () => [at(-1, 19), at(-1, 20)], 'in-the-past', /in the past/],
  ])('refuses %s', async (_what, instrument, range, rule, message) => {
    const [startsAt, endsAt] = range();
    const res = await book(researcher, { instrumentIds: [tag[instrument]], startsAt, endsAt });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('booking_rule');
    expect(ruleOf(res)).toContain(rule);
    expect(res.body.error.details.issues.find((i: { rule: string }) => i.rule === rule).message).toMatch(message);
  });

  it('refuses an instrument that needs a qualification the person does not hold', async () => {
    const res = await book(researcher2, { instrumentIds: [tag['PS-1']], startsAt: at(4, 19), endsAt: at(4, 20) });
    expect(res.status).toBe(422);
    expect(ruleOf(res)).toEqual(['qualification-missing']);
  });

  it('refuses a booking closer than the minimum gap (PS-1 needs 30 minutes)', async () => {
    expect((await book(researcher, { instrumentIds: [tag['PS-1']], startsAt: at(5, 17), endsAt: at(5, 19) })).status).toBe(201);
    const close = await book(researcher, { instrumentIds: [tag['PS-1']], startsAt: at(5, 19, 10), endsAt: at(5, 20) });
    expect(close.status).toBe(422);
    expect(ruleOf(close)).toEqual(['too-close']);
    expect((await book(researcher, { instrumentIds: [tag['PS-1']], startsAt: at(5, 19, 30), endsAt: at(5, 20) })).status).toBe(201);
  });

  it('lets a manager override an overdue calibration, and records it', async () => {
    expect((await book(researcher, { instrumentIds: [tag['SG-3']], startsAt: at(4, 19), endsAt: at(4, 20), overrideCalibration: true })).status).toBe(403);
    const res = await book(manager, { instrumentIds: [tag['SG-3']], startsAt: at(4, 19), endsAt: at(4, 20), overrideCalibration: true });
    expect(res.status).toBe(201);
    expect(res.body.booking.calibrationOverride).toBe(true);
    const detail = await manager.agent.get(`/api/bookings/${res.body.booking.id}`).expect(200);
    expect(detail.body.events.map((e: { action: string }) => e.action)).toEqual(['created', 'calibration-override']);
    expect(detail.body.events[1].actor.name).toBe('Ilse Marwood');
  });

  it('lets managers add maintenance blocks that block like bookings; researchers cannot', async () => {
    expect((await book(researcher, { instrumentIds: [tag['OS-1']], startsAt: at(7, 19), endsAt: at(7, 23), kind: 'maintenance' })).status).toBe(403);
    expect((await book(manager, { instrumentIds: [tag['OS-1']], startsAt: at(7, 19), endsAt: at(7, 23), kind: 'maintenance', purpose: 'Firmware update' })).status).toBe(201);
    const res = await book(researcher, { instrumentIds: [tag['OS-1']], startsAt: at(7, 20), endsAt: at(7, 21) });
    expect(res.status).toBe(409);
    expect(res.body.error.details.clashes[0].kind).toBe('maintenance');
  });
});

describe('lifecycle', () => {
  it('check-in opens 15 minutes before the start; check-out needs a handover note; the audit trail records each step', async () => {
    const later = await book(researcher, { instrumentIds: [tag['PSU-1']], startsAt: at(2, 19), endsAt: at(2, 20) });
    const early = await researcher.agent.post(`/api/bookings/${later.body.booking.id}/check-in`).set('x-csrf-token', researcher.csrf);
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/15 minutes before/);

    const soon = new Date(Date.now() + 10 * 60_000);
    const res = await book(researcher, { instrumentIds: [tag['SMU-1']], startsAt: soon.toISOString(), endsAt: new Date(soon.getTime() + 3600_000).toISOString() });
    const id = res.body.booking.id;
    await researcher.agent.post(`/api/bookings/${id}/check-in`).set('x-csrf-token', researcher.csrf).expect(200);
    const noNote = await researcher.agent.post(`/api/bookings/${id}/check-out`).set('x-csrf-token', researcher.csrf).send({ handoverNote: '' });
    expect(noNote.status).toBe(400);
    const out = await researcher.agent
      .post(`/api/bookings/${id}/check-out`)
      .set('x-csrf-token', researcher.csrf)
      .send({ handoverNote: 'SMU outputs off, compliance 10 mA left set.', leftConnected: 'Triax cables to PS-2 DC arms' });
    expect(out.status, JSON.stringify(out.body)).toBe(200);
    expect(out.body.booking).toMatchObject({ status: 'completed', handoverNote: 'SMU outputs off, compliance 10 mA left set.' });
    const detail = await researcher.agent.get(`/api/bookings/${id}`).expect(200);
    expect(detail.body.events.map((e: { action: string }) => e.action)).toEqual(['created', 'checked-in', 'checked-out']);
    // Leaving early released the rest of the slot: the hour is bookable again.
    const again = await book(researcher2, { instrumentIds: [tag['SMU-1']], startsAt: new Date(soon.getTime() + 30 * 60_000).toISOString(), endsAt: new Date(soon.getTime() + 50 * 60_000).toISOString() });
    expect(again.status).toBe(201);
  });

  it('marks a booking not checked in 30 minutes after its start as no-show and releases it', async () => {
    const start = new Date(Date.now() + 2 * 60_000);
    const res = await book(researcher, { instrumentIds: [tag['SG-1']], startsAt: start.toISOString(), endsAt: new Date(start.getTime() + 2 * 3600_000).toISOString() });
    expect(res.status).toBe(201);
    const lab = { ...t.config.lab, publicUrl: t.config.publicUrl };
    expect(await markNoShows(new Date(start.getTime() + 29 * 60_000), lab)).toBe(0);
    expect(await markNoShows(new Date(start.getTime() + 31 * 60_000), lab)).toBeGreaterThanOrEqual(1);
    const detail = await researcher.agent.get(`/api/bookings/${res.body.booking.id}`).expect(200);
    expect(detail.body.booking.status).toBe('no-show');
    expect(detail.body.events.at(-1)).toMatchObject({ action: 'no-show', actor: null });
    const [row] = await t.db.sequelize.query<{ active: boolean }>('SELECT active FROM booking_instruments WHERE booking_id = :id', { replacements: { id: res.body.booking.id }, type: QueryTypes.SELECT });
    expect(row!.active).toBe(false);
  });

  it('only the owner or a manager may cancel, with a reason; cancelling offers the slot to the first person waiting', async () => {
    const res = await book(researcher, { instrumentIds: [tag['NA-1']], startsAt: at(8, 18), endsAt: at(8, 20) });
    const id = res.body.booking.id;
    const wait = await researcher2.agent.post('/api/waitlist').set('x-csrf-token', researcher2.csrf).send({ instrumentId: tag['NA-1'], startsAt: at(8, 18), endsAt: at(8, 19) });
    expect(wait.status).toBe(201);
    expect(wait.body.entry.status).toBe('waiting');

    const other = await researcher2.agent.post(`/api/bookings/${id}/cancel`).set('x-csrf-token', researcher2.csrf).send({ reason: 'I want it' });
    expect(other.status).toBe(403);
    const noReason = await researcher.agent.post(`/api/bookings/${id}/cancel`).set('x-csrf-token', researcher.csrf).send({ reason: ' ' });
    expect(noReason.status).toBe(400);
    const cancelled = await manager.agent.post(`/api/bookings/${id}/cancel`).set('x-csrf-token', manager.csrf).send({ reason: 'NA-1 port 2 needs repair' });
    expect(cancelled.status).toBe(200);
    expect(cancelled.body.booking).toMatchObject({ status: 'cancelled', cancelReason: 'NA-1 port 2 needs repair' });

    const mine = await researcher2.agent.get('/api/waitlist/mine').expect(200);
    expect(mine.body.entries.find((e: { id: number }) => e.id === wait.body.entry.id)).toMatchObject({ status: 'offered' });
    const free = await researcher2.agent.post('/api/waitlist').set('x-csrf-token', researcher2.csrf).send({ instrumentId: tag['NA-1'], startsAt: at(8, 18), endsAt: at(8, 19) });
    expect(free.status).toBe(409);
  });

  it('moving a booking re-checks the rules; another researcher cannot move it', async () => {
    const res = await book(researcher, { instrumentIds: [tag['SG-1']], startsAt: at(9, 19), endsAt: at(9, 20) });
    const id = res.body.booking.id;
    expect((await researcher2.agent.patch(`/api/bookings/${id}`).set('x-csrf-token', researcher2.csrf).send({ startsAt: at(9, 18) })).status).toBe(403);
    const moved = await researcher.agent.patch(`/api/bookings/${id}`).set('x-csrf-token', researcher.csrf).send({ startsAt: at(9, 20), endsAt: at(9, 22) });
    expect(moved.status).toBe(200);
    expect(moved.body.booking.startsAt).toBe(at(9, 20));
    const tooLong = await researcher.agent.patch(`/api/bookings/${id}`).set('x-csrf-token', researcher.csrf).send({ endsAt: at(10, 12) });
    expect(tooLong.status).toBe(422);
    const detail = await researcher.agent.get(`/api/bookings/${id}`).expect(200);
    expect(detail.body.events.at(-1)).toMatchObject({ action: 'moved', before: { startsAt: at(9, 19) }, after: { startsAt: at(9, 20) } });
  });

  it('my bookings lists upcoming and past', async () => {
    const res = await researcher.agent.get('/api/bookings/mine').expect(200);
    expect(res.body.upcoming.length).toBeGreaterThan(0);
    expect(res.body.past.some((b: { status: string }) => b.status === 'completed')).toBe(true);
    expect((await visitor.agent.get('/api/bookings/mine')).status).toBe(403);
    expect((await request(t.app).get('/api/bookings/mine')).status).toBe(401);
  });
});
