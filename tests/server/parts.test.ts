import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMigrator } from '../../server/db/migrator.js';
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
const cable = { tag: 'c-900', kind: 'cable', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'male', lengthMm: 500, dielectric: 'ptfe', velocityFactor: 0.695 };
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
    ['lossDb', { tag: 'AT-99', kind: 'attenuator', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female' }],
    ['genderA', { ...cable, tag: 'C-901', genderA: 'plug' }],
    ['genderB', { ...cable, tag: 'C-901', genderB: undefined }],
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
    expect(header!.split(',').slice(0, 7)).toEqual(['tag', 'kind', 'description', 'connectorA', 'genderA', 'connectorB', 'genderB']);
    expect(lines.length).toBe(await partCount());
  });

  it('an import with one bad row imports nothing and names the row and field', async () => {
    const before = await partCount();
    const csv = [
      'tag,kind,connectorA,genderA,connectorB,genderB,lengthMm,dielectric,lossDb',
      'C-700,cable,sma,male,sma,male,250,ptfe,',
      'C-701,cable,sma,male,sma,male,-4,ptfe,',
      'AT-70,attenuator,sma,male,sma,female,,,10',
      'C-700,cable,sma,male,sma,male,100,ptfe,',
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
    const csv = 'tag,kind,connectorA,genderA,connectorB,genderB,lengthMm,dielectric,velocityFactor\nC-800,cable,sma,male,sma,male,250,ptfe,0.7\nC-801,cable,n,male,n,female,1000,solid-pe,\n';
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

describe('connector genders', () => {
  const genderRow = async (tag: string) =>
    (await t.db.sequelize.query<{ gender_a: string; gender_b: string }>('SELECT gender_a, gender_b FROM parts WHERE tag = :tag', { replacements: { tag }, type: QueryTypes.SELECT }))[0];

  it('a new part stores each end’s gender; PATCH changes one', async () => {
    const res = await manager.agent.post('/api/parts').set('x-csrf-token', manager.csrf).send({
      tag: 'AD-90', kind: 'adapter', connectorA: '2.92mm', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 0.06, delayPs: 36,
    });
    expect(res.status).toBe(201);
    expect(res.body.part).toMatchObject({ connectorA: '2.92mm', genderA: 'male', connectorB: 'sma', genderB: 'female' });
    expect(await genderRow('AD-90')).toEqual({ gender_a: 'male', gender_b: 'female' });
    const patched = await manager.agent.patch(`/api/parts/${res.body.part.id}`).set('x-csrf-token', manager.csrf).send({ genderB: 'male' });
    expect(patched.status).toBe(200);
    expect(patched.body.part).toMatchObject({ genderA: 'male', genderB: 'male' });
    expect(await genderRow('AD-90')).toEqual({ gender_a: 'male', gender_b: 'male' });
    const bad = await manager.agent.patch(`/api/parts/${res.body.part.id}`).set('x-csrf-token', manager.csrf).send({ genderA: 'jack' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details).toEqual([{ path: 'genderA', message: 'Choose male (plug) or female (jack)' }]);
  });

  it('every demo part has a gender on both ends', async () => {
    const { parts } = (await visitor.agent.get('/api/parts').expect(200)).body as { parts: { tag: string; genderA: string; genderB: string }[] };
    for (const p of parts) {
      expect(['male', 'female'], p.tag).toContain(p.genderA);
      expect(['male', 'female'], p.tag).toContain(p.genderB);
    }
    const byTag = new Map(parts.map((p) => [p.tag, p]));
    expect(byTag.get('C-001')).toMatchObject({ genderA: 'male', genderB: 'male' });
    expect(byTag.get('AT-10A')).toMatchObject({ genderA: 'male', genderB: 'female' });
    expect(byTag.get('SP-01')).toMatchObject({ genderA: 'female', genderB: 'female' });
    expect(byTag.get('AD-03')).toMatchObject({ connectorA: 'n', genderA: 'male', connectorB: 'sma', genderB: 'female' });
  });

  it('the demo’s solver shelf: 16 SMA m/m cables whose single differences reach every mm from 1 to 90, barrels and 2.92 mm savers', async () => {
    type Row = { tag: string; kind: string; connectorA: string; genderA: string; connectorB: string; genderB: string; lengthMm: number | null; delayPs: number | null; lossDb: number | null; status: string };
    const { parts } = (await visitor.agent.get('/api/parts').expect(200)).body as { parts: Row[] };
    const cables = parts.filter((p) => p.tag.startsWith('CB-SMA-'));
    expect(cables).toHaveLength(16);
    for (const c of cables) expect(c).toMatchObject({ kind: 'cable', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'male', status: 'ok' });
    const lengths = cables.map((c) => c.lengthMm!);
    const differences = new Set(lengths.flatMap((a) => lengths.map((b) => a - b)).filter((d) => d > 0));
    for (let mm = 1; mm <= 90; mm++) expect(differences.has(mm), `${mm} mm`).toBe(true);

    const barrels = parts.filter((p) => p.kind === 'adapter' && p.connectorA === 'sma' && p.connectorB === 'sma' && p.genderA === 'female' && p.genderB === 'female');
    const trimBarrels = barrels.filter((b) => b.delayPs !== null && b.delayPs >= 30 && b.delayPs <= 45 && b.lossDb !== null && b.lossDb <= 0.1);
    expect(trimBarrels.length).toBeGreaterThanOrEqual(4);
    expect(trimBarrels.length).toBeLessThanOrEqual(6);
    const savers = parts.filter((p) => p.connectorA === '2.92mm' && p.genderA === 'male' && p.connectorB === 'sma' && p.genderB === 'female');
    expect(savers.length).toBeGreaterThanOrEqual(2);
  });
});

describe('CSV genders', () => {
  it('a file without the gender columns is refused and names them', async () => {
    const before = await partCount();
    const res = await manager.agent.post('/api/parts/import').set('x-csrf-token', manager.csrf).set('content-type', 'text/csv')
      .send('tag,kind,connectorA,connectorB,lengthMm,dielectric\nC-750,cable,sma,sma,250,ptfe\n');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_csv');
    expect(res.body.error.message).toContain('missing columns: genderA, genderB');
    expect(res.body.error.message).toContain('male (plug) or female (jack)');
    expect(await partCount()).toBe(before);
  });

  it('an empty or unknown gender cell is a per-row error on that column', async () => {
    const csv = [
      'tag,kind,connectorA,genderA,connectorB,genderB,lengthMm,dielectric',
      'C-760,cable,sma,,sma,male,250,ptfe',
      'C-761,cable,sma,male,sma,jack,250,ptfe',
      'C-762,cable,sma,male,sma,male,250,ptfe',
    ].join('\n');
    const res = await manager.agent.post('/api/parts/import').set('x-csrf-token', manager.csrf).set('content-type', 'text/csv').send(csv);
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { row: 2, field: 'genderA', message: 'Choose male (plug) or female (jack)' },
      { row: 3, field: 'genderB', message: 'Choose male (plug) or female (jack)' },
    ]);
  });

  it('an export imports back with the same genders (under new tags)', async () => {
    const exported = (await visitor.agent.get('/api/parts/export.csv')).text;
    const [header, ...lines] = exported.trim().split('\r\n');
    const renamed = [header, ...lines.filter((l) => /^(AD-0[1-5]|AT-10A|SP-01|C-050),/.test(l)).map((l) => `RT-${l}`)].join('\r\n');
    const res = await manager.agent.post('/api/parts/import').set('x-csrf-token', manager.csrf).set('content-type', 'text/csv').send(renamed);
    expect(res.status).toBe(201);
    expect(res.body.imported).toBe(8);
    const rows = await t.db.sequelize.query<{ tag: string; same: boolean }>(
      `SELECT c.tag, (c.gender_a, c.gender_b, c.connector_a, c.connector_b) = (o.gender_a, o.gender_b, o.connector_a, o.connector_b) AS same
         FROM parts c JOIN parts o ON c.tag = 'RT-' || o.tag`,
      { type: QueryTypes.SELECT },
    );
    expect(rows).toHaveLength(8);
    for (const r of rows) expect(r.same, r.tag).toBe(true);
  });
});

describe('migration 20261201000700-add-part-genders', () => {
  it('down drops the columns; up gives stored parts the usual genders of their kind and refuses other values', async () => {
    const other = await startTestApp();
    try {
      const sql = <T extends object>(q: string) => other.db.sequelize.query<T>(q, { type: QueryTypes.SELECT });
      const columns = async () => (await sql<{ column_name: string }>(`SELECT column_name FROM information_schema.columns WHERE table_name = 'parts' AND column_name LIKE 'gender%' ORDER BY 1`)).map((c) => c.column_name);
      const migrator = createMigrator(other.db.sequelize);
      await migrator.down({ to: '20261201000700-add-part-genders' });
      expect(await columns()).toEqual([]);
      await migrator.up();
      expect(await columns()).toEqual(['gender_a', 'gender_b']);
      const rows = await sql<{ tag: string; gender_a: string; gender_b: string }>(`SELECT tag, gender_a, gender_b FROM parts WHERE tag IN ('C-001', 'AT-03', 'DB-01', 'AD-03', 'SP-01', 'X-01')`);
      expect(Object.fromEntries(rows.map((r) => [r.tag, `${r.gender_a}/${r.gender_b}`]))).toEqual({
        'C-001': 'male/male', // cable
        'AT-03': 'male/female', // attenuator
        'DB-01': 'male/female', // dc-block
        'AD-03': 'female/female', // adapter: the kind's default, whatever the demo recorded
        'SP-01': 'female/female', // splitter
        'X-01': 'male/female', // other
      });
      expect((await sql<{ n: string }>(`SELECT count(*) AS n FROM parts WHERE gender_a IS NULL OR gender_b IS NULL`))[0]!.n).toBe('0');
      await expect(other.db.sequelize.query(`UPDATE parts SET gender_a = 'plug' WHERE tag = 'C-001'`)).rejects.toThrow(/parts_gender_a_check/);
      await expect(other.db.sequelize.query(`UPDATE parts SET gender_b = NULL WHERE tag = 'C-001'`)).rejects.toThrow(/null value/);
    } finally {
      await other.close();
    }
  });
});
