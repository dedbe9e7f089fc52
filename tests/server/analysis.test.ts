import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn, startTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let visitor: Awaited<ReturnType<typeof signIn>>;
beforeAll(async () => {
  t = await startTestApp();
  visitor = await signIn(t.app, 'visitor@lab.test');
});
afterAll(() => t.close());

/** The worked example of the analysis contract (README, "Analysis API"). */
const example = {
  array: { elements: 2, spacingMm: 75 },
  sources: [
    { key: 'want', role: 'desired', frequencyHz: 2e9, powerDbm: -10 },
    { key: 'jam', role: 'interferer', frequencyHz: 2.4e9, powerDbm: -10 },
  ],
  paths: [
    { source: 'want', channel: 0, segments: [{ kind: 'cable', lengthMm: 1000, velocityFactor: 0.695, lossDbPerM: 0.5, lossRefHz: 1e9 }] },
    { source: 'want', channel: 1, segments: [{ kind: 'cable', lengthMm: 1000, velocityFactor: 0.695 }] },
    { source: 'jam', channel: 0, segments: [{ kind: 'cable', lengthMm: 1000, velocityFactor: 0.695 }, { kind: 'attenuator', lossDb: 10 }] },
    { source: 'jam', channel: 1, segments: [{ kind: 'cable', lengthMm: 1040, velocityFactor: 0.695 }, { kind: 'attenuator', lossDb: 10 }] },
  ],
  combiner: { delaysPs: [0, 0], gains: [1, 1] },
  inputs: [{ channel: 0, maxInputDbm: 10 }, { channel: 1, maxInputDbm: 10 }],
  nullSearch: { interferer: 'jam', maxDelayPs: 500, stepPs: 1 },
};

describe('POST /api/analysis', () => {
  it('evaluates the worked example for any signed-in role', async () => {
    const res = await visitor.agent.post('/api/analysis').set('x-csrf-token', visitor.csrf).send(example);
    expect(res.status).toBe(200);
    // 40 mm extra at VF 0.695: 4799.483 ps/m × 0.04 m = 191.9793 ps (RF-PRIMER W-01); c·Δτ = 57.55396 mm; sinθ = 57.55396/75.
    const jam = res.body.sources.find((s: { key: string }) => s.key === 'jam');
    expect(Math.abs(jam.relativeDelaysPs[1] - 191.97934) / 191.97934).toBeLessThan(1e-6);
    expect(Math.abs(jam.pathDifferenceMm[1] - 40 / 0.695)).toBeLessThan(1e-6);
    expect(Math.abs(jam.angleDeg - (Math.asin(40 / 0.695 / 75) * 180) / Math.PI)).toBeLessThan(1e-9);
    expect(res.body.sources.find((s: { key: string }) => s.key === 'want').angleDeg).toBe(0);
    // 0.5 dB/m at 1 GHz scaled by √2 at 2 GHz over 1 m = 0.7071 dB (√f model, RF-PRIMER §6).
    expect(Math.abs(res.body.paths[0].lossDb - 0.5 * Math.SQRT2)).toBeLessThan(1e-9);
    expect(res.body.rejectionDb).toBeGreaterThan(0);
    expect(res.body.bestNull.rejectionDb).toBeGreaterThan(res.body.rejectionDb);
    expect(res.body.pattern.angleDeg).toHaveLength(181);
    expect(Object.keys(res.body.pattern.responseDb).sort()).toEqual(['jam', 'want']);
  });

  it('resolves inventory parts by id', async () => {
    const parts = (await visitor.agent.get('/api/parts')).body.parts;
    const c3 = parts.find((p: { tag: string }) => p.tag === 'C-003');
    const c4 = parts.find((p: { tag: string }) => p.tag === 'C-004');
    const doc = {
      array: { elements: 2, spacingHalfWavelengthAtHz: 5e9 },
      sources: [{ key: 'a', role: 'desired', frequencyHz: 5e9, powerDbm: -20 }],
      paths: [
        { source: 'a', channel: 0, segments: [{ partId: c3.id }] },
        { source: 'a', channel: 1, segments: [{ partId: c4.id }] },
      ],
      combiner: { delaysPs: [0, 0] },
    };
    const res = await visitor.agent.post('/api/analysis').set('x-csrf-token', visitor.csrf).send(doc);
    expect(res.status).toBe(200);
    // C-004 is 10 mm longer at VF 0.695: 28.68203° for d = λ/2 at 5 GHz (RF-PRIMER W-04).
    expect(Math.abs(res.body.sources[0].angleDeg - 28.68203)).toBeLessThan(1e-5);
  });

  it.each([
    ['an unknown source key', { ...example, paths: [...example.paths.slice(0, 3), { ...example.paths[3], source: 'ghost' }] }, 'paths.3.source'],
    ['a channel out of range', { ...example, paths: [...example.paths.slice(0, 3), { ...example.paths[3], channel: 2 }] }, 'paths.3.channel'],
    ['a missing path', { ...example, paths: example.paths.slice(0, 3) }, 'paths'],
    ['a negative length', { ...example, paths: [{ ...example.paths[0], segments: [{ kind: 'cable', lengthMm: -5, velocityFactor: 0.7 }] }, ...example.paths.slice(1)] }, 'paths.0.segments.0.lengthMm'],
    ['a velocity factor above 1', { ...example, paths: [{ ...example.paths[0], segments: [{ kind: 'cable', lengthMm: 5, velocityFactor: 1.3 }] }, ...example.paths.slice(1)] }, 'paths.0.segments.0.velocityFactor'],
    ['an unknown part', { ...example, paths: [{ ...example.paths[0], segments: [{ partId: 99999 }] }, ...example.paths.slice(1)] }, 'paths.0.segments.0.partId'],
  ])('refuses %s with 400 and the field path', async (_what, body, path) => {
    const res = await visitor.agent.post('/api/analysis').set('x-csrf-token', visitor.csrf).send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(path);
  });

  it('is 401 when signed out', async () => {
    const agent = request.agent(t.app);
    const csrf = (await agent.get('/api/auth/csrf')).body.token;
    expect((await agent.post('/api/analysis').set('x-csrf-token', csrf).send(example)).status).toBe(401);
  });
});
