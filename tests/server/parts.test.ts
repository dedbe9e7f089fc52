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

const partCount = async () => Number((await t.db.sequelize.query<{ n: string }>('SELECT count(*) AS n FROM parts', { type: QueryTypes.SELECT }))[0]!.n);
const cable = { tag: 'c-900', kind: 'cable', connectorA: 'sma', connectorB: 'sma', lengthMm: 500, dielectric: 'ptfe', velocityFactor: 0.695 };
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('GET /api/parts', () => {
  it('every cable carries its computed delayPs; a measured delay wins', async () => {
    const res = await visitor.agent.get('/api/parts?kind=cable').expect(200);
    const c3 = res.body.parts.find((p: { tag: string }) => p.tag === 'C-003');
    // 250 mm at VF 0.695: 4799.483 ps/m × 0.25 m (RF-PRIMER W-01)
    expect(rel(c3.delayPs, 4799.483 * 0.25)).toBeLessThan(1e-6);
    expect(c3.delaySource).toBe('computed');
    const c11 = res.body.parts.find((p: { tag: string }) => p.tag === 'C-011');
    expect(c11).toMatchObject({ delayPs: 866.4, delaySource: 'measured' });
    for (const p of res.body.parts) expect(typeof p.delayPs).toBe('number');
  });
});

describe('writing parts', () => {
  it('researchers and visitors cannot create parts (403)', async () => {
    const before = await partCount();
    for (const who of [researcher, visitor]) {
      expect((await who.agent.post('/api/parts').set('x-csrf-token', who.csrf).send(cable)).status).toBe(403);
    }
    expect(await partCount()).toBe(before);
  });

  it('a manager adds a cable and gets L/(VF·c) back: 500 mm at VF 0.695 is 2399.742 ps (RF-PRIMER W-03)', async () => {
    const res = await manager.agent.post('/api/parts').set('x-csrf-token', manager.csrf).send(cable);
    expect(res.status).toBe(201);
    expect(res.body.part.tag).toBe('C-900');
    expect(rel(res.body.part.delayPs, 2399.742)).toBeLessThan(1e-6);
    expect(rel(res.body.part.delayPerMetrePs, 4799.483)).toBeLessThan(1e-6);
    expect(rel(res.body.part.freeSpaceLengthMm, 500 / 0.695)).toBeLessThan(1e-9);
  });

  it.each([
    ['lengthMm', { ...cable, tag: 'C-901', lengthMm: 0 }],
    ['lengthMm', { ...cable, tag: 'C-901', lengthMm: -3 }],
    ['velocityFactor', { ...cable, tag: 'C-901', velocityFactor: 1.2 }],
    ['velocityFactor', { ...cable, tag: 'C-901', velocityFactor: 0 }],
    ['connectorB', { ...cable, tag: 'C-901', connectorB: 'F-type' }],
    ['velocityFactor', { ...cable, tag: 'C-901', dielectric: 'other', velocityFactor: null }],
    ['lossDb', { tag: 'AT-99', kind: 'attenuator', connectorA: 'sma', connectorB: 'sma' }],
  ])('refuses a bad %s with a message on that field', async (field, body) => {
    const res = await manager.agent.post('/api/parts').set('x-csrf-token', manager.csrf).send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(field);
  });

  it('refuses a duplicate tag with 409', async () => {
    const res = await manager.agent.post('/api/parts').set('x-csrf-token', manager.csrf).send({ ...cable, tag: 'C-001' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('tag_taken');
    expect(res.body.error.details[0].path).toBe('tag');
  });

  it('PATCH records a measured delay, which then overrides the computed one', async () => {
    const id = (await visitor.agent.get('/api/parts?q=C-005')).body.parts[0].id;
    const res = await manager.agent.patch(`/api/parts/${id}`).set('x-csrf-token', manager.csrf).send({ measuredDelayPs: 1451.2, measuredOn: '2026-11-20', measuredHow: 'VNA NA-1' });
    expect(res.status).toBe(200);
    expect(res.body.part).toMatchObject({ delayPs: 1451.2, delaySource: 'measured', lengthMm: 300 });
    expect(rel(res.body.part.computedDelayPs, 4799.483 * 0.3)).toBeLessThan(1e-6);
  });
});

describe('CSV', () => {
  it('exports the inventory with the API field names as header', async () => {
    const res = await visitor.agent.get('/api/parts/export.csv').expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const [header, ...lines] = res.text.trim().split('\r\n');
    expect(header!.split(',').slice(0, 5)).toEqual(['tag', 'kind', 'description', 'connectorA', 'connectorB']);
    expect(lines.length).toBe(await partCount());
  });

  it('an import with one bad row imports nothing and names the row and field', async () => {
    const before = await partCount();
    const csv = [
      'tag,kind,connectorA,connectorB,lengthMm,dielectric,lossDb',
      'C-700,cable,sma,sma,250,ptfe,',
      'C-701,cable,sma,sma,-4,ptfe,',
      'AT-70,attenuator,sma,sma,,,10',
      'C-700,cable,sma,sma,100,ptfe,',
    ].join('\n');
    const res = await manager.agent.post('/api/parts/import').set('x-csrf-token', manager.csrf).set('content-type', 'text/csv').send(csv);
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { row: 3, field: 'lengthMm', message: 'Length must be above 0 mm' },
      { row: 5, field: 'tag', message: 'Tag C-700 is already used in row 2' },
    ]);
    expect(await partCount()).toBe(before);
  });

  it('a clean import stores every row; researchers may not import', async () => {
    const csv = 'tag,kind,connectorA,connectorB,lengthMm,dielectric,velocityFactor\nC-800,cable,sma,sma,250,ptfe,0.7\nC-801,cable,n,n,1000,solid-pe,\n';
    expect((await researcher.agent.post('/api/parts/import').set('x-csrf-token', researcher.csrf).set('content-type', 'text/csv').send(csv)).status).toBe(403);
    const before = await partCount();
    const res = await manager.agent.post('/api/parts/import').set('x-csrf-token', manager.csrf).set('content-type', 'text/csv').send(csv);
    expect(res.status).toBe(201);
    expect(res.body.imported).toBe(2);
    expect(await partCount()).toBe(before + 2);
  });

  it('re-importing an export of the inventory refuses every existing tag', async () => {
    const exported = (await visitor.agent.get('/api/parts/export.csv')).text;
    const res = await manager.agent.post('/api/parts/import').set('x-csrf-token', manager.csrf).set('content-type', 'text/csv').send(exported);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('tag_taken');
  });

  it('a file with unknown columns is refused with the expected columns', async () => {
    const res = await manager.agent.post('/api/parts/import').set('x-csrf-token', manager.csrf).set('content-type', 'text/csv').send('tag,colour\nC-1,red\n');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_csv');
    expect(res.body.error.message).toContain('colour');
  });
});
