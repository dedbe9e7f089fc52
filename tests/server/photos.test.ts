import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { crc32 } from 'node:zlib';
import sharp from 'sharp';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentWithCsrf, signIn, startTestApp, type TestApp } from '../support/test-app.js';

const MAX_BYTES = 200_000;

let t: TestApp;
let uploadsDir: string;
let instrumentId: number;
let partId: number;
type Session = Awaited<ReturnType<typeof signIn>>;
/** One signed-in session per demo role, shared by the tests (sign-in is deliberately slow). */
let as: Record<'manager' | 'researcher' | 'visitor', Session>;

beforeAll(async () => {
  uploadsDir = mkdtempSync(path.join(os.tmpdir(), 'skewbench-photos-'));
  t = await startTestApp({ UPLOADS_DIR: uploadsDir, PHOTO_MAX_BYTES: String(MAX_BYTES) });
  instrumentId = await insertId(`INSERT INTO instruments (tag, name, kind) VALUES ('PHOTO-T1', 'Photo test analyser', 'spectrum-analyzer') RETURNING id`);
  as = {
    manager: await signIn(t.app, 'manager@lab.test'),
    researcher: await signIn(t.app, 'researcher@lab.test'),
    visitor: await signIn(t.app, 'visitor@lab.test'),
  };
  partId = await insertId(`INSERT INTO parts (tag, kind, connector_a, gender_a, connector_b, gender_b) VALUES ('PHOTO-T2', 'adapter', 'sma', 'female', '2.92mm', 'male') RETURNING id`);
});
afterAll(async () => {
  await t.close();
  rmSync(uploadsDir, { recursive: true, force: true });
});

async function insertId(sql: string): Promise<number> {
  const [row] = await t.db.sequelize.query<{ id: number }>(sql, { type: QueryTypes.SELECT });
  return row.id;
}

interface PhotoRow {
  id: number;
  subject_type: string;
  subject_id: number;
  owner_id: number;
  caption: string;
  width: number;
  height: number;
  bytes: number;
  thumb_width: number;
  thumb_height: number;
  file_key: string;
}

const photoRow = async (id: number) =>
  (await t.db.sequelize.query<PhotoRow>('SELECT * FROM photos WHERE id = :id', { replacements: { id }, type: QueryTypes.SELECT }))[0];

/** The uploads folder's files and the photos table's rows, to prove a refusal left nothing behind. */
async function snapshot() {
  const [{ count }] = await t.db.sequelize.query<{ count: string }>('SELECT count(*) FROM photos', { type: QueryTypes.SELECT });
  return { files: readdirSync(uploadsDir).sort(), rows: Number(count) };
}

const storedFile = (key: string, variant: 'display' | 'thumb') => path.join(uploadsDir, `${key}.${variant}.webp`);

interface Upload {
  data: Buffer;
  filename: string;
  contentType: string;
}

type Agent = Awaited<ReturnType<typeof agentWithCsrf>>['agent'];

function upload(agent: Agent, csrf: string, fields: Record<string, string | number>, file?: Upload, fileField = 'file') {
  let req = agent.post('/api/photos').set('x-csrf-token', csrf);
  for (const [name, value] of Object.entries(fields)) req = req.field(name, String(value));
  if (file) req = req.attach(fileField, file.data, { filename: file.filename, contentType: file.contentType });
  return req;
}

const solid = (width: number, height: number) =>
  sharp({ create: { width, height, channels: 3, background: { r: 184, g: 98, b: 44 } } });

const png = async (width: number, height: number): Promise<Upload> => ({
  data: await solid(width, height).png().toBuffer(),
  filename: 'bench.png',
  contentType: 'image/png',
});

const jpeg = async (width: number, height: number): Promise<Upload> => ({
  data: await solid(width, height).jpeg().toBuffer(),
  filename: 'bench.jpg',
  contentType: 'image/jpeg',
});

/** A valid PNG whose IHDR chunk (with a correct CRC) claims 30000 × 30000 pixels: a decompression bomb's header. */
async function forgedHugePng(): Promise<Upload> {
  const data = Buffer.from(await solid(8, 8).png().toBuffer());
  data.writeUInt32BE(30000, 16);
  data.writeUInt32BE(30000, 20);
  data.writeUInt32BE(crc32(data.subarray(12, 29)), 29);
  return { data, filename: 'huge.png', contentType: 'image/png' };
}

describe('POST /api/photos: a manager adds photos of inventory', () => {
  it('stores a PNG of a part: 201, the row, an upright display version and a thumbnail within 320 px', async () => {
    const { agent, csrf, user } = as.manager;
    const res = await upload(agent, csrf, { subjectType: 'part', subjectId: partId, caption: '  SMA to 2.92 mm adapter  ' }, await png(1200, 800));
    expect(res.status).toBe(201);
    const photo = res.body.photo;
    expect(photo).toMatchObject({
      subjectType: 'part',
      subjectId: partId,
      ownerId: user.id,
      ownerName: 'Ilse Marwood',
      caption: 'SMA to 2.92 mm adapter',
      width: 1200,
      height: 800,
      displayUrl: `/api/photos/${photo.id}/display`,
      thumbUrl: `/api/photos/${photo.id}/thumb`,
    });
    const row = await photoRow(photo.id);
    expect(row).toMatchObject({ subject_type: 'part', subject_id: partId, owner_id: user.id, width: 1200, height: 800, bytes: photo.bytes });
    expect(row.file_key).toMatch(/^[0-9a-f-]{36}$/);
    expect(row.file_key).not.toContain('bench');

    const display = readFileSync(storedFile(row.file_key, 'display'));
    expect(display.length).toBe(row.bytes);
    const thumb = await sharp(storedFile(row.file_key, 'thumb')).metadata();
    expect(thumb.format).toBe('webp');
    expect(Math.max(thumb.width, thumb.height)).toBeLessThanOrEqual(320);
    expect([thumb.width, thumb.height]).toEqual([row.thumb_width, row.thumb_height]);
  });

  it('stores a JPEG of an instrument, shrinking the display version to 2048 px on the longest side', async () => {
    const { agent, csrf } = as.manager;
    const res = await upload(agent, csrf, { subjectType: 'instrument', subjectId: instrumentId }, await jpeg(3000, 1000));
    expect(res.status).toBe(201);
    expect(res.body.photo).toMatchObject({ width: 2048, height: 683, caption: '' });
    const row = await photoRow(res.body.photo.id);
    expect(existsSync(storedFile(row.file_key, 'display'))).toBe(true);
    expect(existsSync(storedFile(row.file_key, 'thumb'))).toBe(true);
    expect([row.thumb_width, row.thumb_height]).toEqual([320, 107]);
  });

  it('turns a JPEG upright by its EXIF orientation and keeps no EXIF, orientation or GPS data', async () => {
    const data = await solid(400, 200)
      .jpeg()
      .withMetadata({ orientation: 6 })
      .withExif({ IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '52/1 30/1 0/1' } })
      .toBuffer();
    const original = await sharp(data).metadata();
    expect(original.orientation).toBe(6);
    expect(original.exif).toBeDefined();

    const { agent, csrf } = as.manager;
    const res = await upload(agent, csrf, { subjectType: 'part', subjectId: partId }, { data, filename: 'IMG_0001.JPG', contentType: 'image/jpeg' });
    expect(res.status).toBe(201);
    expect(res.body.photo).toMatchObject({ width: 200, height: 400 });
    const row = await photoRow(res.body.photo.id);
    for (const variant of ['display', 'thumb'] as const) {
      const stored = await sharp(storedFile(row.file_key, variant)).metadata();
      expect(stored.width).toBeLessThan(stored.height);
      expect(stored.exif).toBeUndefined();
      expect(stored.orientation).toBeUndefined();
      expect(stored.xmp).toBeUndefined();
      expect(readFileSync(storedFile(row.file_key, variant)).includes('GPS')).toBe(false);
    }
  });
});

describe('POST /api/photos: who may upload', () => {
  it.each([
    ['researcher', 'part'],
    ['researcher', 'instrument'],
    ['visitor', 'part'],
  ] as const)('a %s uploading a photo of a %s → 403 forbidden, nothing stored', async (role, subjectType) => {
    const before = await snapshot();
    const { agent, csrf } = as[role];
    const subjectId = subjectType === 'part' ? partId : instrumentId;
    const res = await upload(agent, csrf, { subjectType, subjectId }, await png(64, 64));
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
    expect(await snapshot()).toEqual(before);
  });

  it('signed out → 401 unauthenticated, nothing stored', async () => {
    const before = await snapshot();
    const { agent, csrf } = await agentWithCsrf(t.app);
    const res = await upload(agent, csrf, { subjectType: 'part', subjectId: partId }, await png(64, 64));
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
    expect(await snapshot()).toEqual(before);
  });

  it('without the CSRF token → 403 csrf_invalid before the body is read', async () => {
    const { agent } = as.manager;
    const res = await agent.post('/api/photos').field('subjectType', 'part').field('subjectId', String(partId)).attach('file', (await png(64, 64)).data, 'a.png');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
  });

  it('a missing part → 404; setups (no table yet) → 404; both store nothing', async () => {
    const before = await snapshot();
    const manager = as.manager;
    const missing = await upload(manager.agent, manager.csrf, { subjectType: 'part', subjectId: 999999 }, await png(64, 64));
    expect(missing.status).toBe(404);
    expect(missing.body.error).toMatchObject({ code: 'not_found', message: 'Part was not found.' });
    // Until the setups feature adds its table, no setup exists, and asking must not become a 500.
    const researcher = as.researcher;
    const setup = await upload(researcher.agent, researcher.csrf, { subjectType: 'setup', subjectId: 1 }, await png(64, 64));
    expect(setup.status).toBe(404);
    expect(setup.body.error.code).toBe('not_found');
    expect(await snapshot()).toEqual(before);
  });
});

describe('POST /api/photos: refused files leave nothing in uploads/ or the database', () => {
  const text: Upload = { data: Buffer.from('Bench log: cable C-017 re-measured at 4 GHz.\n'), filename: 'photo.jpg', contentType: 'image/jpeg' };
  const svg: Upload = {
    data: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="64" height="64"><rect width="64" height="64" fill="#b8622c"/></svg>'),
    filename: 'drawing.svg',
    contentType: 'image/svg+xml',
  };
  const cases: { name: string; make: () => Promise<Upload>; status: number; code: string }[] = [
    { name: 'a text file renamed .jpg', make: async () => text, status: 400, code: 'invalid_image' },
    {
      name: 'a truncated JPEG',
      make: async () => {
        const data = await sharp({ create: { width: 300, height: 200, channels: 3, background: '#000', noise: { type: 'gaussian', mean: 128, sigma: 40 } } }).jpeg().toBuffer();
        return { data: data.subarray(0, Math.floor(data.length * 0.6)), filename: 'cut.jpg', contentType: 'image/jpeg' };
      },
      status: 400,
      code: 'invalid_image',
    },
    { name: 'an SVG', make: async () => svg, status: 400, code: 'invalid_image' },
    { name: 'an SVG sent as image/png', make: async () => ({ ...svg, filename: 'drawing.png', contentType: 'image/png' }), status: 400, code: 'invalid_image' },
    {
      name: 'a GIF',
      make: async () => ({ data: await solid(32, 32).gif().toBuffer(), filename: 'anim.gif', contentType: 'image/gif' }),
      status: 400,
      code: 'invalid_image',
    },
    {
      name: `a file over PHOTO_MAX_BYTES (${MAX_BYTES} bytes)`,
      make: async () => {
        const data = await solid(400, 400).png({ compressionLevel: 0 }).toBuffer();
        expect(data.length).toBeGreaterThan(MAX_BYTES);
        return { data, filename: 'big.png', contentType: 'image/png' };
      },
      status: 413,
      code: 'payload_too_large',
    },
    { name: 'a PNG whose header claims 30000 × 30000 pixels', make: forgedHugePng, status: 400, code: 'image_too_large' },
  ];

  it.each(cases)('$name → $status $code', async ({ make, status, code }) => {
    const before = await snapshot();
    const { agent, csrf } = as.manager;
    const res = await upload(agent, csrf, { subjectType: 'part', subjectId: partId }, await make());
    expect(res.status).toBe(status);
    expect(res.body.error.code).toBe(code);
    expect(res.body.error.message).toEqual(expect.any(String));
    expect(await snapshot()).toEqual(before);
  });

  it('says why a huge image is refused, with its size and the limit', async () => {
    const { agent, csrf } = as.manager;
    const res = await upload(agent, csrf, { subjectType: 'part', subjectId: partId }, await forgedHugePng());
    expect(res.body.error.message).toBe(
      'The image is 30000 × 30000 pixels (900 megapixels); the most Skewbench accepts is 50 megapixels. Scale it down and try again.',
    );
  });

  it('names the format it refuses, and the size limit', async () => {
    const { agent, csrf } = as.manager;
    const gif = await upload(agent, csrf, { subjectType: 'part', subjectId: partId }, { data: await solid(8, 8).gif().toBuffer(), filename: 'x.jpg', contentType: 'image/jpeg' });
    expect(gif.body.error.message).toBe('Only JPEG, PNG and WebP photos are accepted; this file is GIF.');
    const big = await upload(agent, csrf, { subjectType: 'part', subjectId: partId }, { data: Buffer.alloc(MAX_BYTES + 1, 0xff), filename: 'x.jpg', contentType: 'image/jpeg' });
    expect(big.status).toBe(413);
    expect(big.body.error.message).toBe('The file is larger than 195 KB, the most Skewbench accepts for a photo.');
  });

  it.each([
    ['no file', undefined, 'file'],
    ['the file in another field', 'photo', 'file'],
  ])('%s → 400 validation_failed on the file field', async (_name, fileField, issuePath) => {
    const before = await snapshot();
    const { agent, csrf } = as.manager;
    const res = await upload(agent, csrf, { subjectType: 'part', subjectId: partId }, fileField ? await png(16, 16) : undefined, fileField);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details).toEqual([{ path: issuePath, message: expect.any(String) }]);
    expect(await snapshot()).toEqual(before);
  });

  it('refuses bad fields with every field path', async () => {
    const { agent, csrf } = as.manager;
    const res = await upload(agent, csrf, { subjectType: 'bench', subjectId: 'abc', caption: 'x'.repeat(501) }, await png(16, 16));
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['caption', 'subjectId', 'subjectType']);
  });
});

describe('reading photos', () => {
  let otherPartId: number;
  let ids: number[];

  beforeAll(async () => {
    otherPartId = await insertId(`INSERT INTO parts (tag, kind, connector_a, gender_a, connector_b, gender_b) VALUES ('PHOTO-T3', 'dc-block', 'sma', 'male', 'sma', 'female') RETURNING id`);
    const { agent, csrf } = as.manager;
    ids = [];
    for (const caption of ['first', 'second']) {
      const res = await upload(agent, csrf, { subjectType: 'part', subjectId: otherPartId, caption }, await png(500, 300));
      ids.push(res.body.photo.id);
    }
  });

  it('lists a subject’s photos newest first, to any signed-in person', async () => {
    const { agent } = as.visitor;
    const res = await agent.get(`/api/photos?subjectType=part&subjectId=${otherPartId}`);
    expect(res.status).toBe(200);
    expect(res.body.photos.map((p: { id: number }) => p.id)).toEqual([ids[1], ids[0]]);
    expect(res.body.photos[0]).toMatchObject({ caption: 'second', ownerName: 'Ilse Marwood', width: 500, height: 300 });
  });

  it('refuses a list without a valid subject (400) and to the signed-out (401)', async () => {
    const { agent } = as.visitor;
    const bad = await agent.get('/api/photos?subjectType=bench');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['query.subjectId', 'query.subjectType']);
    const { agent: anonymous } = await agentWithCsrf(t.app);
    expect((await anonymous.get(`/api/photos?subjectType=part&subjectId=${otherPartId}`)).status).toBe(401);
  });

  it('serves the display version and the thumbnail as private WebP to signed-in people only', async () => {
    const { agent } = as.visitor;
    const row = await photoRow(ids[0]);
    const display = await agent.get(`/api/photos/${ids[0]}/display`).buffer(true);
    expect(display.status).toBe(200);
    expect(display.headers['content-type']).toBe('image/webp');
    expect(display.headers['cache-control']).toMatch(/^private/);
    expect(display.body.length).toBe(row.bytes);
    const thumb = await agent.get(`/api/photos/${ids[0]}/thumb`).buffer(true);
    expect(thumb.status).toBe(200);
    expect((await sharp(thumb.body).metadata()).width).toBe(row.thumb_width);

    const { agent: anonymous } = await agentWithCsrf(t.app);
    const denied = await anonymous.get(`/api/photos/${ids[0]}/display`);
    expect(denied.status).toBe(401);
    expect(denied.body.error.code).toBe('unauthenticated');
    const missing = await agent.get('/api/photos/999999/thumb');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('not_found');
  });
});

describe('changing and removing a photo: its owner or a manager', () => {
  let photoId: number;
  let fileKey: string;
  let owner: Session;

  // The owner must not be a manager, or the owner rule would go untested; researchers cannot add inventory
  // photos, so a manager adds one and is then made a researcher.
  beforeAll(async () => {
    const manager = as.manager;
    const created = await manager.agent
      .post('/api/users')
      .set('x-csrf-token', manager.csrf)
      .send({ email: 'wren.castellan@lab.test', name: 'Wren Castellan', role: 'manager', password: 'photo-owner-pass' })
      .expect(201);
    owner = await signIn(t.app, 'wren.castellan@lab.test', 'photo-owner-pass');
    const res = await upload(owner.agent, owner.csrf, { subjectType: 'part', subjectId: partId, caption: 'before' }, await png(300, 300));
    expect(res.status).toBe(201);
    photoId = res.body.photo.id;
    fileKey = (await photoRow(photoId)).file_key;
    await manager.agent.patch(`/api/users/${created.body.user.id}`).set('x-csrf-token', manager.csrf).send({ role: 'researcher' }).expect(200);
  });

  it('the owner edits the caption', async () => {
    const res = await owner.agent.patch(`/api/photos/${photoId}`).set('x-csrf-token', owner.csrf).send({ caption: ' Cable bend radius check ' });
    expect(res.status).toBe(200);
    expect(res.body.photo).toMatchObject({ id: photoId, caption: 'Cable bend radius check', ownerName: 'Wren Castellan' });
    expect((await photoRow(photoId)).caption).toBe('Cable bend radius check');
  });

  it('another researcher can neither edit nor delete it (403), and nothing changes', async () => {
    const { agent, csrf } = as.researcher;
    const edit = await agent.patch(`/api/photos/${photoId}`).set('x-csrf-token', csrf).send({ caption: 'mine now' });
    expect(edit.status).toBe(403);
    expect(edit.body.error.code).toBe('forbidden');
    const removal = await agent.delete(`/api/photos/${photoId}`).set('x-csrf-token', csrf);
    expect(removal.status).toBe(403);
    expect((await photoRow(photoId)).caption).toBe('Cable bend radius check');
    expect(existsSync(storedFile(fileKey, 'display'))).toBe(true);
  });

  it('a manager edits any caption; unknown fields and ids are refused', async () => {
    const { agent, csrf } = as.manager;
    const res = await agent.patch(`/api/photos/${photoId}`).set('x-csrf-token', csrf).send({ caption: 'Bend radius, 25 mm' });
    expect(res.status).toBe(200);
    expect(res.body.photo.caption).toBe('Bend radius, 25 mm');
    expect((await agent.patch(`/api/photos/${photoId}`).set('x-csrf-token', csrf).send({ ownerId: 1 })).status).toBe(400);
    expect((await agent.patch('/api/photos/999999').set('x-csrf-token', csrf).send({ caption: 'x' })).status).toBe(404);
  });

  it('the owner deletes it: 204, the row and both files are gone', async () => {
    const res = await owner.agent.delete(`/api/photos/${photoId}`).set('x-csrf-token', owner.csrf);
    expect(res.status).toBe(204);
    expect(await photoRow(photoId)).toBeUndefined();
    expect(existsSync(storedFile(fileKey, 'display'))).toBe(false);
    expect(existsSync(storedFile(fileKey, 'thumb'))).toBe(false);
    expect((await owner.agent.get(`/api/photos/${photoId}/display`)).status).toBe(404);
    expect((await owner.agent.delete(`/api/photos/${photoId}`).set('x-csrf-token', owner.csrf)).status).toBe(404);
  });
});
