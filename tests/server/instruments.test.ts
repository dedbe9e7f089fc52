import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn, startTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let manager: Awaited<ReturnType<typeof signIn>>;
let researcher: Awaited<ReturnType<typeof signIn>>;
let visitor: Awaited<ReturnType<typeof signIn>>;
beforeAll(async () => {
  t = await startTestApp();
  [manager, researcher, visitor] = await Promise.all([
    signIn(t.app, 'manager@lab.test'),
    signIn(t.app, 'researcher@lab.test'),
    signIn(t.app, 'visitor@lab.test'),
  ]);
});
afterAll(() => t.close());

const newInstrument = { tag: 'sg-9', name: 'Test generator', kind: 'signal-generator', minFrequencyHz: 1e6, maxFrequencyHz: 6e9, calibrationDueOn: '2030-01-01' };
const count = async (tag: string) =>
  (await t.db.sequelize.query<{ n: string }>('SELECT count(*) AS n FROM instruments WHERE tag = :tag', { replacements: { tag }, type: QueryTypes.SELECT }))[0]!.n;

describe('GET /api/instruments', () => {
  it('lists the demo instruments to every signed-in role, with calibration states', async () => {
    for (const who of [visitor, researcher, manager]) {
      const res = await who.agent.get('/api/instruments').expect(200);
      const tags = res.body.instruments.map((i: { tag: string }) => i.tag);
      expect(tags).toContain('PS-1');
      const sg3 = res.body.instruments.find((i: { tag: string }) => i.tag === 'SG-3');
      expect(sg3.calibration.state).toBe('overdue');
      expect(res.body.instruments.find((i: { tag: string }) => i.tag === 'SG-2').calibration.state).toBe('due-soon');
    }
  });

  it('filters by kind and status and searches tag, name and location', async () => {
    const byKind = await visitor.agent.get('/api/instruments?kind=probe-station').expect(200);
    expect(byKind.body.instruments.map((i: { tag: string }) => i.tag)).toEqual(['PS-1', 'PS-2']);
    const byStatus = await visitor.agent.get('/api/instruments?status=maintenance').expect(200);
    expect(byStatus.body.instruments.map((i: { tag: string }) => i.tag)).toEqual(['SA-2']);
    const search = await visitor.agent.get('/api/instruments?q=network').expect(200);
    expect(search.body.instruments.map((i: { tag: string }) => i.tag)).toEqual(['NA-1']);
    const bad = await visitor.agent.get('/api/instruments?kind=toaster');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('query.kind');
  });

  it('is 401 when signed out', async () => {
    expect((await request(t.app).get('/api/instruments')).status).toBe(401);
  });
});

describe('writing instruments', () => {
  it('researchers and visitors cannot create or change instruments (403), and nothing is stored', async () => {
    for (const who of [researcher, visitor]) {
      const res = await who.agent.post('/api/instruments').set('x-csrf-token', who.csrf).send(newInstrument);
      expect(res.status).toBe(403);
      expect((await who.agent.patch('/api/instruments/1').set('x-csrf-token', who.csrf).send({ name: 'x' })).status).toBe(403);
    }
    expect(await count('SG-9')).toBe('0');
  });

  it('a manager creates one (tag normalised to upper case) and it reads back with defaults', async () => {
    const res = await manager.agent.post('/api/instruments').set('x-csrf-token', manager.csrf).send(newInstrument);
    expect(res.status).toBe(201);
    expect(res.body.instrument).toMatchObject({ tag: 'SG-9', status: 'in-service', minGapMinutes: 0, qualificationRequired: false, calibration: { state: 'ok' } });
    const got = await visitor.agent.get(`/api/instruments/${res.body.instrument.id}`).expect(200);
    expect(got.body.instrument.maxFrequencyHz).toBe(6e9);
  });

  it('refuses a duplicate tag with 409 tag_taken on the tag field', async () => {
    const res = await manager.agent.post('/api/instruments').set('x-csrf-token', manager.csrf).send({ ...newInstrument, tag: 'PS-1' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('tag_taken');
    expect(res.body.error.details).toEqual([{ path: 'tag', message: expect.any(String) }]);
  });

  it('refuses bad values with field paths', async () => {
    const res = await manager.agent
      .post('/api/instruments')
      .set('x-csrf-token', manager.csrf)
      .send({ tag: 'bad tag!', name: '', kind: 'toaster', calibrationDueOn: '2026-02-30', minGapMinutes: -5 });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['calibrationDueOn', 'kind', 'minGapMinutes', 'name', 'tag']);
  });

  it('PATCH changes only the given fields and re-checks the whole record', async () => {
    const sa1 = (await manager.agent.get('/api/instruments?q=SA-1')).body.instruments[0];
    const res = await manager.agent.patch(`/api/instruments/${sa1.id}`).set('x-csrf-token', manager.csrf).send({ status: 'maintenance' });
    expect(res.status).toBe(200);
    expect(res.body.instrument).toMatchObject({ status: 'maintenance', maxSafeInputDbm: 30, name: sa1.name });
    const inverted = await manager.agent.patch(`/api/instruments/${sa1.id}`).set('x-csrf-token', manager.csrf).send({ minFrequencyHz: 40e9 });
    expect(inverted.status).toBe(400);
    expect(inverted.body.error.details[0].path).toBe('maxFrequencyHz');
    expect((await manager.agent.get(`/api/instruments/${sa1.id}`)).body.instrument.minFrequencyHz).toBe(2);
  });

  it('answers 404 for an unknown instrument', async () => {
    const res = await visitor.agent.get('/api/instruments/99999');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('qualifications', () => {
  it('lists who holds the qualification; a manager grants and revokes; others cannot', async () => {
    const na1 = (await visitor.agent.get('/api/instruments?q=NA-1')).body.instruments[0];
    const list = await visitor.agent.get(`/api/instruments/${na1.id}/qualifications`).expect(200);
    expect(list.body.qualifications.map((q: { email: string }) => q.email)).toEqual(['researcher@lab.test']);

    const r2 = (await manager.agent.get('/api/users')).body.users.find((u: { email: string }) => u.email === 'researcher2@lab.test');
    const denied = await researcher.agent.post(`/api/instruments/${na1.id}/qualifications`).set('x-csrf-token', researcher.csrf).send({ userId: r2.id });
    expect(denied.status).toBe(403);

    const granted = await manager.agent.post(`/api/instruments/${na1.id}/qualifications`).set('x-csrf-token', manager.csrf).send({ userId: r2.id });
    expect(granted.status).toBe(201);
    expect(granted.body.qualifications.map((q: { email: string }) => q.email).sort()).toEqual(['researcher2@lab.test', 'researcher@lab.test']);
    expect(granted.body.qualifications.find((q: { email: string }) => q.email === 'researcher2@lab.test').grantedBy).toBe('Ilse Marwood');

    await manager.agent.delete(`/api/instruments/${na1.id}/qualifications/${r2.id}`).set('x-csrf-token', manager.csrf).expect(204);
    const after = await visitor.agent.get(`/api/instruments/${na1.id}/qualifications`).expect(200);
    expect(after.body.qualifications).toHaveLength(1);
    expect((await manager.agent.delete(`/api/instruments/${na1.id}/qualifications/${r2.id}`).set('x-csrf-token', manager.csrf)).status).toBe(404);
  });

  it('refuses a qualification for a person who does not exist', async () => {
    const res = await manager.agent.post('/api/instruments/1/qualifications').set('x-csrf-token', manager.csrf).send({ userId: 424242 });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('userId');
  });
});
