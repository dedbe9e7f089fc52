import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn, startTestApp, type TestApp } from '../support/test-app.js';
import { at } from '../support/time.js';

let t: TestApp;
let manager: Awaited<ReturnType<typeof signIn>>;
let researcher: Awaited<ReturnType<typeof signIn>>;
let researcher2: Awaited<ReturnType<typeof signIn>>;
let visitor: Awaited<ReturnType<typeof signIn>>;
const tag: Record<string, number> = {};
const part: Record<string, number> = {};
let bookingA: number; // researcher, SG-2, day+3 19:30–20:30 UTC
let bookingB: number; // researcher2, SG-1, day+3 19:00–21:00 UTC (overlaps A)
let bookingC: number; // researcher, SG-2, day+4

type Who = Awaited<ReturnType<typeof signIn>>;
const book = async (who: Who, tagName: string, startsAt: string, endsAt: string) => {
  const res = await who.agent.post('/api/bookings').set('x-csrf-token', who.csrf).send({ instrumentIds: [tag[tagName]], startsAt, endsAt, purpose: 'Setup test' });
  expect(res.status).toBe(201);
  return res.body.booking.id as number;
};

/** A two-input setup: the desired source on the matched pair C-003/C-004, the interferer on C-005/C-007 with pads. */
const documentWith = (ch1DesiredPart: string) => ({
  title: 'TTD4 two-input rejection',
  analysis: {
    array: { elements: 2, spacingHalfWavelengthAtHz: 5e9 },
    sources: [
      { key: 'want', role: 'desired', frequencyHz: 5e9, powerDbm: -20 },
      { key: 'jam', role: 'interferer', frequencyHz: 5e9, powerDbm: -20 },
    ],
    paths: [
      { source: 'want', channel: 0, segments: [{ partId: part['C-003'] }] },
      { source: 'want', channel: 1, segments: [{ partId: part[ch1DesiredPart] }] },
      { source: 'jam', channel: 0, segments: [{ partId: part['C-005'] }, { partId: part['AT-10A'] }] },
      { source: 'jam', channel: 1, segments: [{ partId: part['C-006'] }, { partId: part['AT-10B'] }] },
    ],
    combiner: { delaysPs: [0, 0] },
    inputs: [{ channel: 0, maxInputDbm: 0 }, { channel: 1, maxInputDbm: 0 }],
  },
  settings: [{ instrumentId: 6, key: 'span', value: '100 MHz' }],
});

beforeAll(async () => {
  t = await startTestApp();
  [manager, researcher, researcher2, visitor] = await Promise.all([
    signIn(t.app, 'manager@lab.test'),
    signIn(t.app, 'researcher@lab.test'),
    signIn(t.app, 'researcher2@lab.test'),
    signIn(t.app, 'visitor@lab.test'),
  ]);
  await t.db.sequelize.query('DELETE FROM waitlist_entries; DELETE FROM bookings;');
  for (const i of (await visitor.agent.get('/api/instruments')).body.instruments) tag[i.tag] = i.id;
  for (const p of (await visitor.agent.get('/api/parts')).body.parts) part[p.tag] = p.id;
  bookingA = await book(researcher, 'SG-2', at(3, 19, 30), at(3, 20, 30));
  bookingB = await book(researcher2, 'SG-1', at(3, 19), at(3, 21));
  bookingC = await book(researcher, 'SG-2', at(4, 19), at(4, 20));
});
afterAll(() => t.close());

const post = (who: Who, path: string, body: unknown) => who.agent.post(path).set('x-csrf-token', who.csrf).send(body as object);
const put = (who: Who, path: string, body: unknown) => who.agent.put(path).set('x-csrf-token', who.csrf).send(body as object);

describe('setups', () => {
  let setupId: number;

  it('the booking’s owner records a setup; the server stores its analysis with the revision', async () => {
    const res = await post(researcher, '/api/setups', { bookingId: bookingA, document: documentWith('C-004'), note: 'First wiring' });
    expect(res.status).toBe(201);
    setupId = res.body.setup.id;
    expect(res.body.setup.revision.number).toBe(1);
    // C-004 is 10 mm longer than C-003 at VF 0.695: 28.68203° at d = λ/2, 5 GHz (RF-PRIMER W-04).
    const want = res.body.setup.revision.analysis.sources.find((s: { key: string }) => s.key === 'want');
    expect(Math.abs(want.angleDeg - 28.68203)).toBeLessThan(1e-5);
    expect(res.body.setup.canEdit).toBe(true);
  });

  it('visitors read but cannot save; another researcher cannot record on someone else’s booking; a manager can', async () => {
    expect((await visitor.agent.get(`/api/setups/${setupId}`)).status).toBe(200);
    expect((await visitor.agent.get(`/api/setups/${setupId}`)).body.setup.canEdit).toBe(false);
    expect((await post(visitor, '/api/setups', { bookingId: bookingA, document: documentWith('C-004') })).status).toBe(403);
    expect((await post(researcher2, '/api/setups', { bookingId: bookingA, document: documentWith('C-004') })).status).toBe(403);
    expect((await put(researcher2, `/api/setups/${setupId}`, { document: documentWith('C-004') })).status).toBe(403);
    expect((await put(manager, `/api/setups/${setupId}`, { document: documentWith('C-004'), note: 'Manager checked' })).status).toBe(200);
  });

  it('a save creates a new revision and the old one reads back unchanged; the database refuses to change a revision', async () => {
    const before = (await researcher.agent.get(`/api/setups/${setupId}/revisions/1`)).body.setup.revision;
    const saved = await put(researcher, `/api/setups/${setupId}`, { document: documentWith('C-007'), note: 'Longer cable on ch 1' });
    expect(saved.status).toBe(200);
    expect(saved.body.setup.revision.number).toBe(3);
    expect(saved.body.setup.revisions.map((r: { number: number }) => r.number)).toEqual([3, 2, 1]);
    const again = (await researcher.agent.get(`/api/setups/${setupId}/revisions/1`)).body.setup.revision;
    expect(again).toEqual(before);
    await expect(t.db.sequelize.query(`UPDATE setup_revisions SET note = 'changed' WHERE setup_id = ${setupId}`)).rejects.toThrow(/immutable/);
  });

  it('compares two revisions: the changed segment, and how the angle moved', async () => {
    const revisions = (await researcher.agent.get(`/api/setups/${setupId}`)).body.setup.revisions;
    const first = revisions.find((r: { number: number }) => r.number === 1).id;
    const last = revisions.find((r: { number: number }) => r.number === 3).id;
    const res = await researcher.agent.get(`/api/setups/compare?from=${first}&to=${last}`).expect(200);
    expect(res.body.diff.segments).toEqual([{ source: 'want', channel: 1, index: 0, change: 'changed', before: 'C-004', after: 'C-007' }]);
    const want = res.body.diff.results.find((r: { source: string }) => r.source === 'want');
    expect(Math.abs(want.angleBefore - 28.68203)).toBeLessThan(1e-5);
    expect(want.angleAfter).toBeNull(); // 250 mm of extra PTFE is far beyond λ/2 spacing: non-physical
  });

  it('reloads a revision into another booking, keeping the link, and flags parts another setup holds in an overlapping booking', async () => {
    const reloaded = await post(researcher, `/api/setups/${setupId}/reload`, { bookingId: bookingC, revision: 1 });
    expect(reloaded.status).toBe(201);
    expect(reloaded.body.setup.reloadedFrom).toEqual({ setupId, revision: 1, title: 'TTD4 two-input rejection' });
    expect(reloaded.body.setup.revision.document.analysis.paths[1].segments[0].partId).toBe(part['C-004']);

    const other = await post(researcher2, '/api/setups', { bookingId: bookingB, document: { ...documentWith('C-004'), title: 'Sunniva’s bench' } });
    expect(other.status).toBe(201);
    const held = other.body.setup.partsHeld.map((h: { tag: string }) => h.tag);
    expect(held).toContain('C-003');
    expect(other.body.setup.partsHeld[0]).toMatchObject({ setupId, bookingId: bookingA, owner: 'Tobiah Renwick' });
    // The reloaded setup's booking (day + 4) overlaps nobody.
    expect(reloaded.body.setup.partsHeld).toEqual([]);
  });

  it('exports the path/segment table as CSV', async () => {
    const res = await researcher.agent.get(`/api/setups/${setupId}/revisions/1/paths.csv`).expect(200);
    const lines = res.text.trim().split('\r\n');
    expect(lines[0]).toBe('source,channel,order,tag,kind,lengthMm,connectorA,connectorB,delayPs,lossDbAtSourceFrequency');
    expect(lines).toHaveLength(1 + 6);
    expect(lines[1]).toMatch(/^want,0,1,C-003,cable,250,sma,sma,1199\.871,/);
  });

  it('answers bad documents with 400 and field paths under document.analysis', async () => {
    const bad = documentWith('C-004');
    bad.analysis.paths[3]!.channel = 5;
    const res = await post(researcher, '/api/setups', { bookingId: bookingA, document: bad });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain('document.analysis.paths.3.channel');
    const unknownPart = documentWith('C-004');
    unknownPart.analysis.paths[0]!.segments = [{ partId: 99999 }];
    const res2 = await post(researcher, '/api/setups', { bookingId: bookingA, document: unknownPart });
    expect(res2.status).toBe(400);
    expect(res2.body.error.details[0].path).toBe('document.analysis.paths.0.segments.0.partId');
    const rows = await t.db.sequelize.query<{ n: string }>('SELECT count(*) AS n FROM setups', { type: QueryTypes.SELECT });
    expect(Number(rows[0]!.n)).toBe(3);
  });
});
