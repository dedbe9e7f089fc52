import fc from 'fast-check';
import { abs, add, complex, exp, multiply, speedOfLight, type Complex } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { analyseSetup, delayAndSumDb, RESPONSE_FLOOR_DB, type AnalysisDocument, type Segment } from '../../shared/domain/analysis.js';
import { SPEED_OF_LIGHT_M_PER_S } from '../../shared/domain/constants.js';
import { amplitudeBound, between, frequencyArb, responsesAgree, setupArb } from '../support/analysis-arbitraries.js';

// A second implementation of the delay-and-sum response in complex arithmetic (mathjs complex/exp/abs), written
// from RF-PRIMER §2, §4 and §12 rather than from the engine: absolute path delays (not relative ones), its own
// segment rules and constants. Agreement is 1e-9 dB, or amplitude ratios within the double-rounding bound where a
// response is too deep for 1e-9 dB to mean anything (tests/support/analysis-arbitraries.ts, responsesAgree).

/** c, exact (BIPM, SI Brochure 9th ed.); checked against mathjs below. */
const C = 299_792_458;
/** ε_r the primer's tests use (RF-PRIMER §1 table): PTFE, solid PE, foamed PE, dry air. */
const PERMITTIVITY = { ptfe: 2.1, 'solid-pe': 2.25, 'foam-pe': 1.38, air: 1.000536 } as const;

/** |Σ w_n·exp(−j·2π·f·τ_n)| / Σ w_n with τ in seconds, or null when every weight is 0. */
function referenceAmplitude(frequencyHz: number, delaysS: number[], weights: number[]): number | null {
  let sum: Complex = complex(0, 0);
  let total = 0;
  delaysS.forEach((tau, n) => {
    sum = add(sum, multiply(weights[n]!, exp(complex(0, -2 * Math.PI * frequencyHz * tau))) as Complex);
    total += weights[n]!;
  });
  return total === 0 ? null : abs(sum) / total;
}

/** The engine's reporting conventions: 20·log10 of the ratio, never above 0 dB, never below the floor. */
const reported = (amplitude: number | null) => (amplitude === null ? RESPONSE_FLOOR_DB : Math.min(0, Math.max(RESPONSE_FLOOR_DB, 20 * Math.log10(amplitude))));

/** Delay (s) and loss (dB) of one segment at f, from the primer: t = L/(VF·c), VF = 1/√ε_r; loss ∝ √f. */
function segmentFacts(s: Segment, frequencyHz: number): { delayS: number; lossDb: number } {
  if (s.kind !== 'cable') return { delayS: (s.delayPs ?? 0) * 1e-12, lossDb: s.lossDb ?? 0 };
  const vf = s.velocityFactor ?? 1 / Math.sqrt(PERMITTIVITY[s.dielectric as keyof typeof PERMITTIVITY]);
  const delayS = s.measuredDelayPs != null ? s.measuredDelayPs * 1e-12 : s.lengthMm / 1000 / (vf * C);
  const lossDb = s.lossDbPerM != null ? s.lossDbPerM * Math.sqrt(frequencyHz / s.lossRefHz!) * (s.lengthMm / 1000) : 0;
  return { delayS, lossDb };
}

function pathOf(doc: AnalysisDocument, key: string, channel: number, frequencyHz: number) {
  const segments = doc.paths.find((p) => p.source === key && p.channel === channel)!.segments;
  return segments.map((s) => segmentFacts(s, frequencyHz)).reduce((a, b) => ({ delayS: a.delayS + b.delayS, lossDb: a.lossDb + b.lossDb }), { delayS: 0, lossDb: 0 });
}

describe('delayAndSumDb against mathjs complex arithmetic', () => {
  it('agrees on random frequencies, delays and weights (1e-9 dB)', () => {
    const caseArb = fc.integer({ min: 1, max: 16 }).chain((n) =>
      fc.record({
        frequencyHz: frequencyArb,
        delaysPs: fc.array(between(-20_000, 20_000), { minLength: n, maxLength: n }),
        weights: fc.array(fc.oneof({ arbitrary: fc.constant(0), weight: 1 }, { arbitrary: between(1e-3, 10), weight: 6 }), { minLength: n, maxLength: n }),
      }),
    );
    fc.assert(
      fc.property(caseArb, ({ frequencyHz, delaysPs, weights }) => {
        const engine = delayAndSumDb(frequencyHz, delaysPs, weights);
        const reference = reported(referenceAmplitude(frequencyHz, delaysPs.map((t) => t * 1e-12), weights));
        const bound = amplitudeBound(2 * Math.PI * frequencyHz * Math.max(...delaysPs.map(Math.abs)) * 1e-12, delaysPs.length);
        expect(responsesAgree(engine, reference, bound), `engine ${engine} dB, mathjs ${reference} dB`).toBe(true);
      }),
      { numRuns: 500 },
    );
  });

  it('agrees at the primer check values W-07 (−12.19490 dB) and W-11 (−23.30919 dB)', () => {
    // W-07: N = 2, 5 GHz, d = λ/2, steered to 20°, source at −30° (RF-PRIMER §10).
    const d = C / (2 * 5e9);
    const tau = (deg: number) => (d * Math.sin((deg * Math.PI) / 180)) / C;
    const w07 = [0, (tau(-30) - tau(20)) * 1e12];
    expect(Math.abs(delayAndSumDb(5e9, w07, [1, 1]) - reported(referenceAmplitude(5e9, w07.map((t) => t * 1e-12), [1, 1])))).toBeLessThan(1e-9);
    expect(Math.abs(reported(referenceAmplitude(5e9, w07.map((t) => t * 1e-12), [1, 1])) - -12.1949)).toBeLessThan(1e-4);
    // W-11: amplitude ratio 0.9 and 5° from opposition.
    const w11 = [0, (185 / 360 / 5e9) * 1e12];
    expect(Math.abs(delayAndSumDb(5e9, w11, [1, 0.9]) - reported(referenceAmplitude(5e9, w11.map((t) => t * 1e-12), [1, 0.9])))).toBeLessThan(1e-9);
    expect(Math.abs(reported(referenceAmplitude(5e9, w11.map((t) => t * 1e-12), [1, 0.9])) - -23.30919)).toBeLessThan(1e-4);
  });
});

describe('analyseSetup against mathjs complex arithmetic', () => {
  it('gives every path the delay and loss of its segments, and every source the response Σ a_n·g_n·e^{−j2πf(T_n + t_n)} (1e-9 dB)', () => {
    fc.assert(
      fc.property(setupArb(), ({ doc }) => {
        const result = analyseSetup(doc);
        const n = doc.array.elements;
        const gains = doc.combiner.gains ?? Array.from({ length: n }, () => 1);
        const chip = doc.combiner.delaysPs;
        for (const source of doc.sources) {
          const paths = Array.from({ length: n }, (_, channel) => pathOf(doc, source.key, channel, source.frequencyHz));
          paths.forEach((p, channel) => {
            const engine = result.paths.find((r) => r.source === source.key && r.channel === channel)!;
            expect(Math.abs(engine.delayPs - p.delayS * 1e12)).toBeLessThanOrEqual(1e-12 * Math.max(1, p.delayS * 1e12));
            expect(Math.abs(engine.lossDb - p.lossDb)).toBeLessThanOrEqual(1e-12 * Math.max(1, p.lossDb));
          });
          // Absolute delays T_n + t_n: the common T_0 the engine subtracts only turns the sum by a fixed phase.
          const delaysS = paths.map((p, i) => p.delayS + chip[i]! * 1e-12);
          const weights = paths.map((p, i) => 10 ** (-p.lossDb / 20) * gains[i]!);
          const reference = reported(referenceAmplitude(source.frequencyHz, delaysS, weights));
          const engine = result.sources.find((s) => s.key === source.key)!.responseDb;
          const bound = amplitudeBound(2 * Math.PI * source.frequencyHz * Math.max(...delaysS), n);
          expect(responsesAgree(engine, reference, bound), `${source.key}: engine ${engine} dB, mathjs ${reference} dB`).toBe(true);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('gives the pattern Σ g_n·e^{−j2πf(n·d·sinθ/c + t_n)} at every whole degree (1e-9 dB)', () => {
    fc.assert(
      fc.property(setupArb({ maxSources: 2 }), ({ doc, spacingMm }) => {
        const result = analyseSetup(doc);
        const n = doc.array.elements;
        const gains = doc.combiner.gains ?? Array.from({ length: n }, () => 1);
        const chip = doc.combiner.delaysPs;
        const d = spacingMm / 1000;
        for (const source of doc.sources) {
          const f = source.frequencyHz;
          const bound = amplitudeBound(2 * Math.PI * f * (((n - 1) * d) / C + Math.max(...chip) * 1e-12), n);
          result.pattern.angleDeg.forEach((deg, k) => {
            const sin = Math.sin((deg * Math.PI) / 180);
            const reference = reported(referenceAmplitude(f, chip.map((t, i) => (i * d * sin) / C + t * 1e-12), gains));
            const engine = result.pattern.responseDb[source.key]![k]!;
            expect(responsesAgree(engine, reference, bound), `${source.key} at ${deg}°: engine ${engine} dB, mathjs ${reference} dB`).toBe(true);
          });
        }
      }),
      { numRuns: 25 },
    );
  });
});

describe('the speed of light', () => {
  it('is 299 792 458 m/s exactly, as mathjs has it (SI definition of the metre, RF-PRIMER §1, §9)', () => {
    expect(SPEED_OF_LIGHT_M_PER_S).toBe(299_792_458);
    expect(speedOfLight.toNumber('m/s')).toBe(SPEED_OF_LIGHT_M_PER_S);
  });
});
