import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { lineDelayPs } from '../../shared/domain/cable.js';
import { mates, type ConnectorEnd } from '../../shared/domain/connectors.js';
import { emulatedAngleDeg, solveCables, targetDelays, type SolverPart, type SolverProblem } from '../../shared/domain/solver.js';
import { bruteForce } from '../support/solver-oracle.js';

const m = (type: ConnectorEnd['type'] = 'sma'): ConnectorEnd => ({ type, gender: 'male' });
const f = (type: ConnectorEnd['type'] = 'sma'): ConnectorEnd => ({ type, gender: 'female' });

let nextId = 1;
function cable(tag: string, lengthMm: number, vf = 0.695, ends: [ConnectorEnd, ConnectorEnd] = [m(), m()]): SolverPart {
  return { id: nextId++, tag, kind: 'cable', ends, delayPs: lineDelayPs(lengthMm, vf), delaySource: 'computed', lengthMm, loss: { dbPerM: 1, refHz: 1e9 } };
}
function part(tag: string, kind: string, delayPs: number, ends: [ConnectorEnd, ConnectorEnd], lossDb = 0.1): SolverPart {
  return { id: nextId++, tag, kind, ends, delayPs, delaySource: 'entered', lengthMm: 0, loss: { db: lossDb } };
}

const base = (parts: SolverPart[], over: Partial<SolverProblem> = {}): SolverProblem => ({
  elements: 2,
  spacingMm: 29.979246,
  sources: [{ key: 'interferer', frequencyHz: 5e9, targetAngleDeg: 28.68203 }],
  tolerancePs: 0.5,
  maxSegments: 3,
  prefer: 'fewest-segments',
  limit: 5,
  parts,
  pathStart: f(),
  pathEnd: f(),
  ...over,
});

describe('targets', () => {
  it('RF-PRIMER W-04: half-wavelength spacing at 5 GHz (29.979246 mm) and 28.68203° need 47.99483 ps between inputs', () => {
    // Source: ../shared/RF-PRIMER.md §10 W-04 (Δτ = 47.99483 ps, θ = 28.68203°; d = c/(2f)).
    const t = targetDelays({ elements: 3, spacingMm: 29.979246 }, { key: 's', frequencyHz: 5e9, targetAngleDeg: 28.68203 });
    expect(t[0]).toBe(0);
    expect(t[1]).toBeCloseTo(47.99483, 3);
    expect(t[2]).toBeCloseTo(2 * 47.99483, 3);
    expect(emulatedAngleDeg([0, 47.99483], 29.979246)).toBeCloseTo(28.68203, 4);
  });
  it('RF-PRIMER W-06: 60 ps over 15 mm is non-physical, no angle', () => {
    // Source: ../shared/RF-PRIMER.md §10 W-06 (c·Δτ/d = 1.199170).
    expect(emulatedAngleDeg([0, 60], 15)).toBeNull();
  });
});

describe('solveCables', () => {
  it('finds the 10 mm longer cable of W-04: the emulated angle is 28.68203° and the error below a femtosecond', () => {
    // Source: ../shared/RF-PRIMER.md §10 W-04: an extra 10 mm at VF 0.695 is 47.99483 ps, θ = 28.68203°.
    const shelf = [cable('A', 300), cable('B', 310), cable('C', 455), cable('D', 620)];
    const answer = solveCables(base(shelf));
    expect(answer.feasible).toBe(true);
    const best = answer.proposals[0]!;
    expect(best.paths.map((p) => p.chain.map((s) => s.tag))).toEqual([['A'], ['B']]);
    expect(best.maxErrorPs).toBeLessThan(1e-3);
    expect(best.sources[0]!.angleDeg).toBeCloseTo(28.68203, 3);
    expect(best.paths[1]!.chainDelayPs - best.paths[0]!.chainDelayPs).toBeCloseTo(47.99483, 3);
    expect(best.paths[0]!.chain[0]!.delaySource).toBe('computed');
    expect(answer.search.complete).toBe(true);
  });

  it('inserts a female/female barrel between two male cables, counting it as a segment', () => {
    // Only a chain cable + barrel + cable reaches 48 ps past the 300 mm cable.
    const shelf = [cable('A', 300), cable('B', 200), cable('C', 99.6), part('BAR', 'adapter', 9.4, [f(), f()])];
    // 200 mm + 99.6 mm = 1436.7 ps, + 9.4 ps barrel ≈ 1446.1; 300 mm = 1439.9: not it. Aim at the chain delay exactly:
    const chainDelay = shelf[1]!.delayPs + shelf[2]!.delayPs + 9.4;
    const answer = solveCables(base(shelf, { sources: [{ key: 's', frequencyHz: 5e9, targetDelaysPs: [0, chainDelay - shelf[0]!.delayPs] }] }));
    expect(answer.feasible).toBe(true);
    const [first, second] = answer.proposals[0]!.paths;
    expect(first!.chain.map((s) => s.tag)).toEqual(['A']);
    expect(second!.chain.map((s) => s.tag)).toHaveLength(3);
    expect(second!.chain[1]!.tag).toBe('BAR');
    expect(second!.segments).toBe(3);
  });

  it('never uses a part twice and every joint mates, across two sources', () => {
    const shelf = [
      ...[250, 262, 274, 286, 300, 313, 326, 339].map((l, i) => cable(`C${i}`, l)),
      part('B1', 'adapter', 30, [f(), f()]),
      part('B2', 'adapter', 31, [f(), f()]),
      part('AT', 'attenuator', 25, [m(), f()], 3),
    ];
    const answer = solveCables(
      base(shelf, {
        sources: [
          { key: 'desired', frequencyHz: 3.5e9, targetAngleDeg: 0 },
          { key: 'interferer', frequencyHz: 3.6e9, targetAngleDeg: -35 },
        ],
        spacingMm: 42.8275,
        tolerancePs: 3,
      }),
    );
    expect(answer.proposals.length).toBeGreaterThan(0);
    for (const proposal of answer.proposals) {
      const ids = proposal.paths.flatMap((p) => p.chain.map((s) => s.partId));
      expect(new Set(ids).size).toBe(ids.length);
      for (const path of proposal.paths) {
        let previous: ConnectorEnd = f();
        for (const segment of path.chain) {
          const p = shelf.find((x) => x.id === segment.partId)!;
          const [s, e] = segment.reversed ? [p.ends[1], p.ends[0]] : p.ends;
          expect(mates(previous, s)).toBe(true);
          previous = e;
        }
        expect(mates(previous, f())).toBe(true);
      }
    }
  });

  it('says what limits it when nothing meets the tolerance, and still gives the closest proposal', () => {
    // −35° at half a wavelength of 3.5 GHz needs about 82 ps between inputs; the two cables differ by 480 ps.
    const shelf = [cable('A', 300), cable('B', 400)];
    const answer = solveCables(base(shelf, { spacingMm: 42.8275, sources: [{ key: 'interferer', frequencyHz: 3.5e9, targetAngleDeg: -35 }] }));
    expect(answer.feasible).toBe(false);
    expect(answer.proposals[0]!.meetsTolerance).toBe(false);
    // The closest: the spread of (delay − target) halves the remaining mismatch around the common offset.
    const mismatch = Math.abs(shelf[1]!.delayPs - shelf[0]!.delayPs - 81.94);
    expect(answer.proposals[0]!.maxErrorPs).toBeCloseTo(mismatch / 2, 0);
    expect(answer.limits.join(' ')).toMatch(/comes closer than/);
  });

  it('finds the closest proposal even when it is far off: two equal cables for 19° (fast-check counterexample)', () => {
    // 30 mm at 19° needs 32.56 ps between the inputs (n·d·sin θ / c); equal cables leave all of it as error, half per path.
    const equal = [part('P0', 'cable', 2.5, [m(), m()]), part('P1', 'cable', 2.5, [m(), m()])];
    const answer = solveCables(base(equal, { spacingMm: 30, sources: [{ key: 's', frequencyHz: 2e9, targetAngleDeg: 19 }], tolerancePs: 0.25, maxSegments: 1, pathStart: null, pathEnd: null }));
    expect(answer.feasible).toBe(false);
    expect(answer.proposals[0]!.maxErrorPs).toBeCloseTo(((30e-3 * Math.sin((19 * Math.PI) / 180)) / 299_792_458) * 1e12 / 2, 6);
  });

  it('explains a target that needs more delay difference than the shelf can give', () => {
    const shelf = [cable('A', 100), cable('B', 101)];
    const answer = solveCables(base(shelf, { elements: 4, spacingMm: 100, sources: [{ key: 's', frequencyHz: 1e9, targetAngleDeg: 60 }], maxSegments: 1 }));
    expect(answer.feasible).toBe(false);
    expect(answer.limits.join(' ')).toMatch(/Only 2 usable parts for 4 paths/);
  });
});

// ----------------------------------------------------------------- against the brute-force oracle

const endArb = fc.record({ type: fc.constantFrom<ConnectorEnd['type']>('sma', '2.92mm', 'n'), gender: fc.constantFrom<ConnectorEnd['gender']>('male', 'female') });
const partArb = fc.record({
  kind: fc.constantFrom('cable', 'adapter', 'attenuator'),
  a: endArb,
  b: endArb,
  delayPs: fc.integer({ min: 5, max: 400 }).map((n) => n / 2),
  lengthMm: fc.integer({ min: 0, max: 500 }),
  lossDb: fc.integer({ min: 0, max: 30 }).map((n) => n / 10),
});

const problemArb = fc
  .record({
    parts: fc.array(partArb, { minLength: 2, maxLength: 6 }),
    elements: fc.integer({ min: 2, max: 3 }),
    twoSources: fc.boolean(),
    maxSegments: fc.integer({ min: 1, max: 2 }),
    tolerancePs: fc.constantFrom(0.25, 1, 5, 20),
    prefer: fc.constantFrom('fewest-segments' as const, 'lowest-loss' as const, 'least-length' as const),
    angles: fc.tuple(fc.integer({ min: -60, max: 60 }), fc.integer({ min: -60, max: 60 })),
    ends: fc.boolean(),
  })
  .map((r): SolverProblem => ({
    elements: r.elements,
    spacingMm: 30,
    sources: (r.twoSources ? [0, 1] : [0]).map((i) => ({ key: `s${i}`, frequencyHz: (i + 2) * 1e9, targetAngleDeg: r.angles[i]! })),
    tolerancePs: r.tolerancePs,
    maxSegments: r.maxSegments,
    prefer: r.prefer,
    limit: 3,
    parts: r.parts.map((p, i) => ({ id: i + 1, tag: `P${i}`, kind: p.kind, ends: [p.a, p.b], delayPs: p.delayPs, delaySource: 'entered', lengthMm: p.lengthMm, loss: { db: p.lossDb } })),
    pathStart: r.ends ? f() : null,
    pathEnd: r.ends ? f() : null,
  }))
  // Brute force must finish: at most 6 paths' worth of parts.
  .filter((p) => p.elements * p.sources.length <= p.parts.length);

/** One source, chains of up to three parts: the solver's path that makes three-part chains only where they can fit. */
const threeSegmentArb = fc
  .record({
    parts: fc.array(partArb, { minLength: 2, maxLength: 6 }),
    elements: fc.integer({ min: 2, max: 3 }),
    tolerancePs: fc.constantFrom(0.25, 1, 5, 20),
    angle: fc.integer({ min: -60, max: 60 }),
    limit: fc.integer({ min: 1, max: 3 }),
  })
  .map((r): SolverProblem => ({
    elements: r.elements,
    spacingMm: 30,
    sources: [{ key: 's0', frequencyHz: 2e9, targetAngleDeg: r.angle }],
    tolerancePs: r.tolerancePs,
    maxSegments: 3,
    prefer: 'fewest-segments',
    limit: r.limit,
    parts: r.parts.map((p, i) => ({ id: i + 1, tag: `P${i}`, kind: p.kind, ends: [p.a, p.b], delayPs: p.delayPs, delaySource: 'entered', lengthMm: p.lengthMm, loss: { db: p.lossDb } })),
    pathStart: null,
    pathEnd: null,
  }))
  .filter((p) => p.elements <= p.parts.length);

describe('solveCables against brute force (fast-check)', () => {
  it('with chains of up to three parts, agrees with the oracle on the best (segments, error)', () => {
    fc.assert(
      fc.property(threeSegmentArb, (problem) => {
        const oracle = bruteForce(problem);
        const answer = solveCables(problem);
        if (oracle.assignments === 0) {
          expect(answer.proposals).toEqual([]);
          return;
        }
        expect(answer.feasible).toBe(oracle.feasible);
        expect(answer.proposals[0]!.maxErrorPs).toBeCloseTo(oracle.errorPs, 6);
        expect(answer.proposals[0]!.totals.segments).toBe(oracle.score);
      }),
      { numRuns: 300 },
    );
  });

  it('agrees on feasibility, and its first proposal has the oracle’s best (score, error)', () => {
    fc.assert(
      fc.property(problemArb, (problem) => {
        const oracle = bruteForce(problem);
        const answer = solveCables(problem);
        if (oracle.assignments === 0) {
          expect(answer.proposals).toEqual([]);
          return;
        }
        expect(answer.feasible).toBe(oracle.feasible);
        const first = answer.proposals[0]!;
        expect(first.maxErrorPs).toBeCloseTo(oracle.errorPs, 6);
        const score =
          problem.prefer === 'fewest-segments' ? first.totals.segments : problem.prefer === 'least-length' ? first.paths.reduce((a, p) => a + p.lengthMm, 0) : first.paths.reduce((a, p) => a + p.lossDb, 0);
        expect(score).toBeCloseTo(oracle.score, 6);
        // Proposals never repeat a part inside one proposal, and every joint mates in the order given.
        for (const p of answer.proposals) {
          const ids = p.paths.flatMap((x) => x.chain.map((s) => s.partId));
          expect(new Set(ids).size).toBe(ids.length);
          for (const path of p.paths) {
            let previous: ConnectorEnd | null = problem.pathStart ?? null;
            for (const segment of path.chain) {
              const part = problem.parts.find((x) => x.id === segment.partId)!;
              const [s, e] = segment.reversed ? [part.ends[1], part.ends[0]] : part.ends;
              if (previous) expect(mates(previous, s)).toBe(true);
              previous = e;
            }
            if (problem.pathEnd) expect(mates(previous!, problem.pathEnd)).toBe(true);
          }
        }
      }),
      { numRuns: 500 },
    );
  });
});
