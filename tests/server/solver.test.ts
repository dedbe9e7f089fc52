// POST /api/solver on the demo inventory: the graded shelf CB-SMA-01…16 (SMA m/m PTFE, 150 mm + a sparse ruler's
// marks, VF 0.695) and the SMA f/f barrels AD-10…14 join the lab's other SMA cables and adapters. Targets at
// 3.5 GHz with half-wavelength spacing (d = c/(2f) = 42.827 mm): −35° needs Δτ = d·sin(−35°)/c = −81.94 ps.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spacingOf } from '../../shared/domain/analysis.js';
import { mates, partEnds, type ConnectorEnd } from '../../shared/domain/connectors.js';
import type { Part } from '../../shared/schemas/parts.js';
import type { SolverProposal, SolverResponse } from '../../shared/schemas/solver.js';
import { agentWithCsrf, signIn, startTestApp, type TestApp } from '../support/test-app.js';
import { at } from '../support/time.js';

let t: TestApp;
type Who = Awaited<ReturnType<typeof signIn>>;
let manager: Who;
let researcher: Who;
let researcher2: Who;
let visitor: Who;
const instrument: Record<string, number> = {};
let parts: Part[] = [];
const byTag = (tag: string) => parts.find((p) => p.tag === tag)!;
const byId = (id: number) => parts.find((p) => p.id === id)!;

let bookingA: number; // researcher, SG-2, day+3 19:30–20:30 UTC: the slot the solver works for
let bookingB: number; // researcher2, SG-1, day+3 19:00–21:00 UTC (overlaps A)
let bookingC: number; // researcher2, SG-1, day+5 19:00–20:00 UTC (overlaps nobody)

const post = (who: Who, path: string, body: unknown) => who.agent.post(path).set('x-csrf-token', who.csrf).send(body as object);
const patch = (who: Who, path: string, body: unknown) => who.agent.patch(path).set('x-csrf-token', who.csrf).send(body as object);
const book = async (who: Who, tag: string, startsAt: string, endsAt: string) => {
  const res = await post(who, '/api/bookings', { instrumentIds: [instrument[tag]], startsAt, endsAt, purpose: 'Solver test' });
  expect(res.status).toBe(201);
  return res.body.booking.id as number;
};
const refreshParts = async () => {
  parts = (await visitor.agent.get('/api/parts').expect(200)).body.parts;
};

const HALF_WAVE_HZ = 3.5e9;
const array = { elements: 2, spacingHalfWavelengthAtHz: HALF_WAVE_HZ };
const twoSources = [
  { key: 'desired', frequencyHz: 3.5e9, targetAngleDeg: 0 },
  { key: 'interferer', frequencyHz: 3.5e9, targetAngleDeg: -35 },
];
const solve = (who: Who, body: Record<string, unknown>) => post(who, '/api/solver', body);
const answerOf = async (who: Who, body: Record<string, unknown>): Promise<SolverResponse> => {
  const res = await solve(who, body);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as SolverResponse;
};

/** A saved setup for `bookingId` whose paths wire `partIds` (one part per path; 2 inputs, 1 source). */
const setupWith = async (who: Who, bookingId: number, title: string, partIds: [number, number]) => {
  const res = await post(who, '/api/setups', {
    bookingId,
    document: {
      title,
      analysis: {
        array,
        sources: [{ key: 's', role: 'desired', frequencyHz: 3.5e9, powerDbm: -20 }],
        paths: partIds.map((partId, channel) => ({ source: 's', channel, segments: [{ partId }] })),
        combiner: { delaysPs: [0, 0] },
      },
    },
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.setup.id as number;
};

const partIdsOf = (p: SolverProposal) => p.paths.flatMap((path) => path.chain.map((s) => s.partId));

/** Each joint of each path mates: the path's start, the chain in the used direction, the chip input. */
function expectEveryJointMates(proposal: SolverProposal, start: ConnectorEnd, input: ConnectorEnd) {
  for (const path of proposal.paths) {
    let previous = start;
    for (const segment of path.chain) {
      const [a, b] = partEnds(byId(segment.partId));
      const [first, last] = segment.reversed ? [b, a] : [a, b];
      expect(mates(previous, first), `${path.source} → ${path.channel}: ${segment.tag} after ${JSON.stringify(previous)}`).toBe(true);
      previous = last;
    }
    expect(mates(previous, input), `${path.source} → ${path.channel} into the chip input`).toBe(true);
  }
}

const SMA_JACK: ConnectorEnd = { type: 'sma', gender: 'female' };

beforeAll(async () => {
  t = await startTestApp();
  [manager, researcher, researcher2, visitor] = await Promise.all([
    signIn(t.app, 'manager@lab.test'),
    signIn(t.app, 'researcher@lab.test'),
    signIn(t.app, 'researcher2@lab.test'),
    signIn(t.app, 'visitor@lab.test'),
  ]);
  await t.db.sequelize.query('DELETE FROM waitlist_entries; DELETE FROM bookings;');
  for (const i of (await visitor.agent.get('/api/instruments')).body.instruments) instrument[i.tag] = i.id;
  await refreshParts();
  bookingA = await book(researcher, 'SG-2', at(3, 19, 30), at(3, 20, 30));
  bookingB = await book(researcher2, 'SG-1', at(3, 19), at(3, 21));
  bookingC = await book(researcher2, 'SG-1', at(5, 19), at(5, 20));
});
afterAll(() => t.close());

describe('POST /api/solver', () => {
  it('proposes chains of the free shelf for desired 0° and interferer −35°: every joint mates and no part appears twice', async () => {
    const answer = await answerOf(researcher, { bookingId: bookingA, array, sources: twoSources });
    expect(answer.feasible).toBe(true);
    expect(answer.proposals.length).toBe(5);
    expect(answer.limits).toEqual([]);
    expect(answer.search.complete).toBe(true);
    // The demo's damaged C-008 is counted, never offered.
    expect(answer.excluded.notOk).toBeGreaterThanOrEqual(1);
    expect(answer.excluded.held).toEqual([]);
    for (const p of answer.proposals) {
      expect(p.meetsTolerance).toBe(true);
      expect(p.maxErrorPs).toBeLessThanOrEqual(0.5 + 1e-9);
      const ids = partIdsOf(p);
      expect(new Set(ids).size).toBe(ids.length);
      expect(ids).not.toContain(byTag('C-008').id);
      for (const id of ids) expect(['cable', 'adapter']).toContain(byId(id).kind);
      expectEveryJointMates(p, SMA_JACK, SMA_JACK);
      expect(p.paths.map((path) => `${path.source}#${path.channel}`)).toEqual(['desired#0', 'desired#1', 'interferer#0', 'interferer#1']);
      const interferer = p.sources.find((s) => s.key === 'interferer')!;
      expect(interferer.targetRelativeDelaysPs[1]).toBeCloseTo(-81.94, 2);
      expect(interferer.relativeDelaysPs[1]! - interferer.targetRelativeDelaysPs[1]!).toBeLessThanOrEqual(1 + 1e-9);
    }
    // Ranked by fewest segments first.
    const segments = answer.proposals.map((p) => p.totals.segments);
    expect(segments).toEqual([...segments].sort((a, b) => a - b));
  });

  it('never proposes damaged or lost parts, nor parts an overlapping booking’s setup wires; a non-overlapping booking’s setup holds nothing', async () => {
    const before = await answerOf(researcher, { bookingId: bookingA, array, sources: twoSources, limit: 10 });
    const used = [...new Set(before.proposals.flatMap(partIdsOf))];
    expect(used.length).toBeGreaterThanOrEqual(6);
    const [damaged, lost, heldX, heldY, laterX, laterY] = used as [number, number, number, number, number, number];
    const restore: number[] = [damaged, lost];
    try {
      await patch(manager, `/api/parts/${damaged}`, { status: 'damaged' }).expect(200);
      await patch(manager, `/api/parts/${lost}`, { status: 'lost' }).expect(200);
      const overlapping = await setupWith(researcher2, bookingB, 'Sunniva’s bench, same evening', [heldX, heldY]);
      const later = await setupWith(researcher2, bookingC, 'Sunniva’s bench, two days later', [laterX, laterY]);

      const after = await answerOf(researcher, { bookingId: bookingA, array, sources: twoSources, limit: 10 });
      expect(after.feasible).toBe(true);
      const proposed = new Set(after.proposals.flatMap(partIdsOf));
      for (const id of [damaged, lost, heldX, heldY]) expect(proposed.has(id), byId(id).tag).toBe(false);
      expect(after.excluded.held).toEqual(
        [heldX, heldY]
          .map((id) => ({ partId: id, tag: byId(id).tag, setupId: overlapping, bookingId: bookingB }))
          .sort((a, b) => a.tag.localeCompare(b.tag)),
      );
      expect(after.excluded.held.some((h) => h.setupId === later)).toBe(false);
      expect(after.excluded.notOk).toBe(before.excluded.notOk + 2);
      expect(after.candidates).toBe(before.candidates - 4);
      for (const p of after.proposals) {
        const ids = partIdsOf(p);
        expect(new Set(ids).size).toBe(ids.length);
        expectEveryJointMates(p, SMA_JACK, SMA_JACK);
      }

      // For the overlapping setup itself its own parts are free; its booking gives the slot, where A's has none.
      const own = await answerOf(researcher2, { setupId: overlapping, array, sources: twoSources });
      expect(own.excluded.held).toEqual([]);
      expect(own.candidates).toBe(after.candidates + 2);
      // In booking C's slot only C's own setup holds parts (for another setup of C): B's setup holds nothing there.
      const inC = await answerOf(researcher2, { bookingId: bookingC, array, sources: twoSources });
      expect(inC.excluded.held.map((h) => h.setupId)).toEqual([later, later]);
      expect(inC.excluded.held.map((h) => h.partId).sort()).toEqual([laterX, laterY].sort());
      expect((await answerOf(researcher2, { setupId: later, array, sources: twoSources })).excluded.held).toEqual([]);
      // Given both, they must agree.
      const mismatch = await solve(researcher2, { setupId: overlapping, bookingId: bookingA, array, sources: twoSources });
      expect(mismatch.status).toBe(400);
      expect(mismatch.body.error.details[0].path).toBe('bookingId');
    } finally {
      for (const id of restore) await patch(manager, `/api/parts/${id}`, { status: 'ok' }).expect(200);
    }
  });

  it('applying a proposal (shared cable and splitter first, then the chain) gives, through the analysis, the proposed delays and an angle within the tolerance', async () => {
    const shared = [byTag('C-002').id, byTag('SP-02').id];
    const sources = [{ key: 'interferer', frequencyHz: 3.5e9, targetAngleDeg: -35 }];
    const answer = await answerOf(researcher, { bookingId: bookingA, array, sources, sharedPartIds: shared, tolerancePs: 0.5, prefer: 'lowest-loss' });
    expect(answer.feasible).toBe(true);
    expect(answer.shared.map((s) => s.tag)).toEqual(['C-002', 'SP-02']);
    const best = answer.proposals[0]!;
    for (const p of answer.proposals) {
      expect(partIdsOf(p)).not.toContain(shared[0]);
      expect(partIdsOf(p)).not.toContain(shared[1]);
      // The chain starts at the splitter's output (an SMA jack).
      expectEveryJointMates(p, partEnds(byTag('SP-02'))[1], SMA_JACK);
    }
    // Ranked by lowest loss among those within the tolerance.
    const losses = answer.proposals.map((p) => p.totals.lossDb);
    expect(losses).toEqual([...losses].sort((a, b) => a - b));

    const analysis = await post(researcher, '/api/analysis', {
      array,
      sources: [{ key: 'interferer', role: 'interferer', frequencyHz: 3.5e9, powerDbm: -20 }],
      paths: best.paths.map((p) => ({ source: p.source, channel: p.channel, segments: [...shared, ...p.chain.map((s) => s.partId)].map((partId) => ({ partId })) })),
      combiner: { delaysPs: [0, 0] },
    });
    expect(analysis.status, JSON.stringify(analysis.body)).toBe(200);
    for (const p of best.paths) {
      const result = analysis.body.paths.find((r: { source: string; channel: number }) => r.source === p.source && r.channel === p.channel);
      expect(result.delayPs).toBeCloseTo(p.delayPs, 6);
    }
    const emulated = analysis.body.sources[0];
    const proposed = best.sources[0]!;
    expect(emulated.relativeDelaysPs[1]).toBeCloseTo(proposed.relativeDelaysPs[1]!, 6);
    expect(emulated.angleDeg).toBeCloseTo(proposed.angleDeg!, 6);
    // Each path within ±0.5 ps of its target: Δτ within ±1 ps of −81.94 ps, i.e. the angle within these bounds.
    const d = spacingOf(array);
    const angleFor = (dt: number) => (Math.asin((dt * 1e-12 * 299_792_458) / (d * 1e-3)) * 180) / Math.PI;
    const target = proposed.targetRelativeDelaysPs[1]!;
    expect(Math.abs(emulated.relativeDelaysPs[1] - target)).toBeLessThanOrEqual(1 + 1e-9);
    expect(emulated.angleDeg).toBeGreaterThanOrEqual(angleFor(target - 1) - 1e-9);
    expect(emulated.angleDeg).toBeLessThanOrEqual(angleFor(target + 1) + 1e-9);
    expect(Math.abs(emulated.angleDeg - -35)).toBeLessThan(0.6);
    expect(proposed.angleErrorDeg).toBeCloseTo(emulated.angleDeg - -35, 6);
  });

  it('an unreachable target gets feasible=false with the closest proposal and what limits it', async () => {
    // 5 ns between two inputs with at most one segment each: no single cable on the shelf is that much longer.
    const answer = await answerOf(researcher, {
      bookingId: bookingA,
      array,
      sources: [{ key: 'far', frequencyHz: 3.5e9, targetDelaysPs: [0, 5000] }],
      maxSegments: 1,
    });
    expect(answer.feasible).toBe(false);
    expect(answer.proposals.length).toBeGreaterThan(0);
    const closest = answer.proposals[0]!;
    expect(closest.meetsTolerance).toBe(false);
    expect(closest.maxErrorPs).toBeGreaterThan(0.5);
    const ids = partIdsOf(closest);
    expect(new Set(ids).size).toBe(ids.length);
    expectEveryJointMates(closest, SMA_JACK, SMA_JACK);
    // The closest is the largest spread of two single cables, ranked by error.
    const errors = answer.proposals.map((p) => p.maxErrorPs);
    expect(errors).toEqual([...errors].sort((a, b) => a - b));
    expect(answer.limits.some((l) => /needs 5000\.0 ps between its earliest and latest input/.test(l))).toBe(true);
    expect(answer.limits.some((l) => /comes closer than/.test(l))).toBe(true);
  });

  it('says so when a damaged or held part would have met the tolerance', async () => {
    // The first pair of free single SMA cables whose difference no other pair comes within 0.2 ps of.
    const held = new Set((await answerOf(researcher, { bookingId: bookingA, array, sources: twoSources, maxSegments: 1 })).excluded.held.map((h) => h.partId));
    const singles = parts.filter((p) => p.kind === 'cable' && p.status === 'ok' && !held.has(p.id) && p.connectorA === 'sma' && p.connectorB === 'sma' && p.genderA === 'male' && p.genderB === 'male' && p.delayPs !== null);
    const pairs = singles.flatMap((a) => singles.filter((b) => b.delayPs! > a.delayPs!).map((b) => ({ a, b, dt: b.delayPs! - a.delayPs! })));
    const unique = pairs.find((x) => pairs.every((y) => y === x || Math.abs(y.dt - x.dt) > 0.2))!;
    expect(unique).toBeDefined();
    const body = { bookingId: bookingA, array, sources: [{ key: 's', frequencyHz: 3.5e9, targetDelaysPs: [0, unique.dt] }], maxSegments: 1, tolerancePs: 0.05 };
    const free = await answerOf(researcher, body);
    expect(free.feasible).toBe(true);
    expect(free.proposals[0]!.paths.map((p) => p.chain[0]!.tag)).toEqual([unique.a.tag, unique.b.tag]);
    try {
      await patch(manager, `/api/parts/${unique.b.id}`, { status: 'damaged' }).expect(200);
      const answer = await answerOf(researcher, body);
      expect(answer.feasible).toBe(false);
      expect(answer.proposals[0]!.meetsTolerance).toBe(false);
      expect(partIdsOf(answer.proposals[0]!)).not.toContain(unique.b.id);
      const line = answer.limits.find((l) => /left out/.test(l));
      expect(line).toMatch(new RegExp(`damaged or lost \\([^)]*${unique.b.tag}`));
      expect(line).toMatch(/With them, a proposal within the tolerance would exist/);
    } finally {
      await patch(manager, `/api/parts/${unique.b.id}`, { status: 'ok' }).expect(200);
    }
  });

  it('refuses shared parts that are unknown, damaged or held, and unknown bookings and setups', async () => {
    const unknown = await solve(researcher, { bookingId: bookingA, array, sources: twoSources, sharedPartIds: [999999] });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details).toEqual([{ path: 'sharedPartIds.0', message: 'No part with id 999999' }]);
    const damaged = await solve(researcher, { bookingId: bookingA, array, sources: twoSources, sharedPartIds: [byTag('C-002').id, byTag('C-008').id] });
    expect(damaged.status).toBe(400);
    expect(damaged.body.error.details).toEqual([{ path: 'sharedPartIds.1', message: 'C-008 is marked damaged' }]);
    const overlapping = await setupWith(researcher2, bookingB, 'Splitter bench', [byTag('C-013').id, byTag('C-014').id]);
    const held = await solve(researcher, { bookingId: bookingA, array, sources: twoSources, sharedPartIds: [byTag('C-013').id] });
    expect(held.status).toBe(400);
    expect(held.body.error.details[0]).toEqual({ path: 'sharedPartIds.0', message: 'C-013 is wired in “Splitter bench” for an overlapping booking' });
    // …but not for that setup itself.
    expect((await solve(researcher2, { setupId: overlapping, array, sources: twoSources, sharedPartIds: [byTag('C-013').id] })).status).toBe(200);

    const noBooking = await solve(researcher, { bookingId: 999999, array, sources: twoSources });
    expect(noBooking.status).toBe(404);
    expect(noBooking.body.error.code).toBe('not_found');
    expect(noBooking.body.error.message).toBe('Booking was not found.');
    const noSetup = await solve(researcher, { setupId: 999999, array, sources: twoSources });
    expect(noSetup.status).toBe(404);
    expect(noSetup.body.error.message).toBe('Setup was not found.');
  });

  it('answers bad input with 400 and the field at fault', async () => {
    const cases: [Record<string, unknown>, string, RegExp][] = [
      [{ array, sources: twoSources }, 'bookingId', /bookingId\) or the setup/],
      [{ bookingId: bookingA, array: { elements: 17, spacingMm: 40 }, sources: twoSources }, 'array.elements', /At most 16 inputs/],
      [{ bookingId: bookingA, array: { elements: 2 }, sources: twoSources }, 'array.spacingMm', /either spacingMm or spacingHalfWavelengthAtHz/],
      [{ bookingId: bookingA, array, sources: [{ key: 'a', frequencyHz: 3.5e9 }] }, 'sources.0.targetAngleDeg', /either targetAngleDeg or targetDelaysPs/],
      [{ bookingId: bookingA, array, sources: [{ key: 'a', frequencyHz: 3.5e9, targetAngleDeg: 0, targetDelaysPs: [0, 1] }] }, 'sources.0.targetAngleDeg', /either targetAngleDeg or targetDelaysPs/],
      [{ bookingId: bookingA, array, sources: [{ key: 'a', frequencyHz: 3.5e9, targetDelaysPs: [0, 1, 2] }] }, 'sources.0.targetDelaysPs', /one target delay per input \(2\)/],
      [{ bookingId: bookingA, array, sources: Array.from({ length: 5 }, (_, i) => ({ key: `s${i}`, frequencyHz: 3.5e9, targetAngleDeg: 0 })) }, 'sources', /At most 4 sources/],
      [{ bookingId: bookingA, array, sources: [twoSources[0], twoSources[0]] }, 'sources.1.key', /used twice/],
      [{ bookingId: bookingA, array, sources: twoSources, tolerancePs: 0 }, 'tolerancePs', /above 0 ps/],
      [{ bookingId: bookingA, array, sources: twoSources, tolerancePs: 101 }, 'tolerancePs', /at most 100 ps/],
      [{ bookingId: bookingA, array, sources: twoSources, maxSegments: 5 }, 'maxSegments', /At most 4 segments/],
      [{ bookingId: bookingA, array, sources: twoSources, prefer: 'cheapest' }, 'prefer', /fewest-segments, lowest-loss or least-length/],
      [{ bookingId: bookingA, array, sources: twoSources, limit: 21 }, 'limit', /At most 20 proposals/],
      [{ bookingId: bookingA, array, sources: twoSources, sharedPartIds: [1, 1] }, 'sharedPartIds', /listed twice/],
      [{ bookingId: bookingA, array, sources: twoSources, inputConnector: { type: 'sma', gender: 'plug' } }, 'inputConnector.gender', /male or female/],
      [{ bookingId: bookingA, array, sources: [{ key: 'a', frequencyHz: 3.5e9, targetAngleDeg: 95 }] }, 'sources.0.targetAngleDeg', /at most \+90°/],
      [{ bookingId: bookingA, array, sources: twoSources, extra: true }, '', /./],
    ];
    for (const [body, path, message] of cases) {
      const res = await solve(researcher, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      const issue = res.body.error.details.find((d: { path: string }) => d.path === path);
      expect(issue, `${path} in ${JSON.stringify(res.body.error.details)}`).toBeDefined();
      expect(issue.message).toMatch(message);
    }
    const notJson = await researcher.agent.post('/api/solver').set('x-csrf-token', researcher.csrf).set('content-type', 'application/json').send('{"array":');
    expect(notJson.status).toBe(400);
    expect(notJson.body.error.code).toBe('invalid_json');
  });

  it('is for researchers and managers: visitors get 403, anonymous callers 401', async () => {
    const body = { bookingId: bookingA, array, sources: twoSources, maxSegments: 1 };
    const denied = await solve(visitor, body);
    expect(denied.status).toBe(403);
    expect(denied.body.error.code).toBe('forbidden');
    expect((await solve(manager, body)).status).toBe(200);
    expect((await solve(researcher2, body)).status).toBe(200);
    const anonymous = await agentWithCsrf(t.app);
    expect((await anonymous.agent.post('/api/solver').set('x-csrf-token', anonymous.csrf).send(body)).status).toBe(401);
  });

  it('answers 422 solver_limit when the shelf allows more chains than the solver searches', async () => {
    // 1200 more SMA m/m cables: about 740 000 pairs of cables, each joined by any of the six SMA f/f barrels, make
    // more than the solver's 3 million chains of 3 segments.
    const header = 'tag,kind,connectorA,genderA,connectorB,genderB,lengthMm,dielectric';
    const rows = Array.from({ length: 1200 }, (_, i) => `BULK-${i + 1},cable,sma,male,sma,male,${300 + i / 2},ptfe`);
    await manager.agent.post('/api/parts/import').set('x-csrf-token', manager.csrf).set('content-type', 'text/csv').send([header, ...rows].join('\n')).expect(201);
    const res = await solve(researcher, { bookingId: bookingA, array, sources: twoSources, maxSegments: 3 });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('solver_limit');
    expect(res.body.error.message).toMatch(/more than the solver's limit/);
    // One segment per path stays well inside the limit.
    expect((await solve(researcher, { bookingId: bookingA, array, sources: twoSources, maxSegments: 1 })).status).toBe(200);
  });
});
