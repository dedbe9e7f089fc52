import { describe, expect, it } from 'vitest';
import {
  analyseSetup,
  delayAndSumDb,
  freeSpaceEquivalentM,
  freeSpacePathLossDb,
  wrapDegrees,
  type AnalysisDocument,
  type Segment,
} from '../../shared/domain/analysis.js';
import { SPEED_OF_LIGHT_M_PER_S as C } from '../../shared/domain/constants.js';

// Check values: RF-PRIMER §10 (computed at high precision, recomputed with mathjs), each with its own source.
const rel = (actual: number | null, expected: number, tol = 1e-6) => {
  expect(actual).not.toBeNull();
  expect(Math.abs(actual! - expected) / Math.abs(expected)).toBeLessThan(tol);
};
const dbClose = (actual: number | null, expected: number, tol = 1e-4) => expect(Math.abs(actual! - expected)).toBeLessThan(tol);
const amplitude = (db: number) => 10 ** (db / 20);

const halfWaveMm = (f: number) => (C / (2 * f)) * 1e3;
const steerPs = (dMm: number, deg: number) => ((dMm * 1e-3 * Math.sin((deg * Math.PI) / 180)) / C) * 1e12;
const delay = (ps: number): Segment => ({ kind: 'adapter', delayPs: ps });

/** A two-source document of pure delays (no loss), channel n of each source delayed by `delays[n]`. */
function doc(elements: number, spacingMm: number, sources: { key: string; role: 'desired' | 'interferer'; f: number; delays: number[] }[], chip: number[]): AnalysisDocument {
  return {
    array: { elements, spacingMm },
    sources: sources.map((s) => ({ key: s.key, role: s.role, frequencyHz: s.f, powerDbm: -10 })),
    paths: sources.flatMap((s) => s.delays.map((ps, channel) => ({ source: s.key, channel, segments: [delay(1000 + ps)] }))),
    combiner: { delaysPs: chip },
  };
}

describe('angle of arrival emulated by extra cable (RF-PRIMER §3)', () => {
  it('W-04: 10 mm extra at VF 0.695, d = λ/2 at 5 GHz → Δτ 47.99483 ps, Δs 14.38849 mm, θ 28.68203°, φ 86.39070°', () => {
    const result = analyseSetup({
      array: { elements: 2, spacingHalfWavelengthAtHz: 5e9 },
      sources: [{ key: 'want', role: 'desired', frequencyHz: 5e9, powerDbm: -10 }],
      paths: [
        { source: 'want', channel: 0, segments: [{ kind: 'cable', lengthMm: 500, velocityFactor: 0.695 }] },
        { source: 'want', channel: 1, segments: [{ kind: 'cable', lengthMm: 510, velocityFactor: 0.695 }] },
      ],
      combiner: { delaysPs: [0, 0] },
    });
    rel(result.spacingMm, 29.979246);
    const s = result.sources[0]!;
    rel(s.relativeDelaysPs[1]!, 47.99483);
    rel(s.pathDifferenceMm[1]!, 14.38849);
    expect(Math.abs(s.angleDeg! - 28.68203)).toBeLessThan(1e-5);
    expect(Math.abs(s.phaseLagDeg[1]! - 86.3907)).toBeLessThan(1e-4);
    expect(s.physical).toBe(true);
  });

  it('W-05: 0.15 m extra at VF 0.70 at 2.4 GHz → phase 617.5701° wraps to −102.4299°', () => {
    expect(Math.abs(wrapDegrees(617.5701) - -102.4299)).toBeLessThan(1e-9);
    const result = analyseSetup(doc(2, 60, [{ key: 'a', role: 'desired', f: 2.4e9, delays: [0, (150e-3 / (0.7 * C)) * 1e12] }], [0, 0]));
    expect(Math.abs(result.sources[0]!.phaseLagDeg[1]! - -102.4299)).toBeLessThan(1e-4);
  });

  it('W-06: d = 15 mm and Δτ = 60 ps gives c·Δτ/d = 1.199170: non-physical, no angle, a warning', () => {
    const result = analyseSetup(doc(2, 15, [{ key: 'a', role: 'desired', f: 5e9, delays: [0, 60] }], [0, 0]));
    const s = result.sources[0]!;
    rel(s.sinTheta, 1.19917);
    expect(s).toMatchObject({ physical: false, angleDeg: null });
    expect(result.warnings.map((w) => w.code)).toContain('non-physical-angle');
  });
});

describe('delay-and-sum response (RF-PRIMER §4)', () => {
  const f = 5e9;
  const d = halfWaveMm(f);

  it('W-07: N = 2, 5 GHz, d = λ/2, steered to 20°, source at −30° → |AF| 0.2456151 (−12.19490 dB)', () => {
    const tau = steerPs(d, -30);
    const chip = [steerPs(d, 20), 0]; // D_1 − D_0 = −d·sin20°/c, shifted so no delay is negative
    const result = analyseSetup(doc(2, d, [{ key: 'j', role: 'interferer', f, delays: [0, tau] }], chip));
    dbClose(result.sources[0]!.responseDb, -12.1949);
    rel(amplitude(result.sources[0]!.responseDb), 0.2456151);
  });

  it('W-08: steered to 20°, the null is at −41.14599°; the same angle at 4.5 and 5.5 GHz gives |AF| 0.1564345', () => {
    const chip = [steerPs(d, 20), 0];
    const at = (freq: number) => delayAndSumDb(freq, [0, steerPs(d, -41.14599) + chip[1]! - chip[0]!], [1, 1]);
    expect(at(f)).toBeLessThan(-100);
    rel(amplitude(at(4.5e9)), 0.1564345, 1e-5);
    rel(amplitude(at(5.5e9)), 0.1564345, 1e-5);
  });

  it('W-10: N = 4, d = λ/2: (a) θ_s 0°, θ 15° → 0.6312293; (b) θ_s 10°, θ −20° → 0.03392546', () => {
    const four = (steer: number, theta: number) =>
      delayAndSumDb(f, [0, 1, 2, 3].map((n) => n * (steerPs(d, theta) - steerPs(d, steer))), [1, 1, 1, 1]);
    rel(amplitude(four(0, 15)), 0.6312293);
    rel(amplitude(four(10, -20)), 0.03392546);
  });

  it('W-11: amplitude ratio 0.9 and 5° from opposition → residual 0.06831884, 23.30919 dB rejection', () => {
    const ps = (185 / 360 / f) * 1e12;
    const r = delayAndSumDb(f, [0, ps], [1, 0.9]);
    rel(amplitude(r), 0.06831884);
    dbClose(-r, 23.30919);
  });

  it('is 0 dB for an aligned source and the rejection is desired minus interferer', () => {
    const tau = steerPs(d, -30);
    const result = analyseSetup(doc(2, d, [
      { key: 'want', role: 'desired', f, delays: [0, 0] },
      { key: 'jam', role: 'interferer', f, delays: [0, tau] },
    ], [0, 0]));
    expect(result.sources[0]!.responseDb).toBe(0);
    dbClose(result.rejectionDb, result.sources[0]!.responseDb - result.sources[1]!.responseDb, 1e-12);
  });

  it('finds the progressive chip delay that nulls the interferer, and the pattern has its minimum there', () => {
    const tau = steerPs(d, -30);
    const base = doc(2, d, [
      { key: 'want', role: 'desired', f, delays: [0, 0] },
      { key: 'jam', role: 'interferer', f, delays: [0, tau] },
    ], [0, 0]);
    const result = analyseSetup({ ...base, nullSearch: { interferer: 'jam', maxDelayPs: 200, stepPs: 1 } });
    expect(result.bestNull!.rejectionDb).toBeGreaterThan(20);
    const tuned = analyseSetup({ ...base, combiner: { delaysPs: result.bestNull!.delaysPs } });
    dbClose(tuned.rejectionDb, result.bestNull!.rejectionDb, 1e-9);
  });
});

describe('losses, powers and free-space equivalents (RF-PRIMER §5, §7)', () => {
  it.each([
    [1000, 1e9, 92.44778], // MathWorks fspl; Python sdr.free_space_path_loss(1e3, 1e9) = 92.44778322188337
    [10_000, 10e9, 132.44778], // MathWorks fspl documentation example
    [3, 2.4e9, 49.59443],
    [1, 28e9, 61.39094],
  ])('W-13: free-space loss over %d m at %d Hz is %f dB', (m, hz, db) => {
    dbClose(freeSpacePathLossDb(m, hz), db);
  });

  it.each([
    [60, 5e9, 4.771345],
    [66, 5e9, 9.520085], // 60 dB with G_t = G_r = 3 dBi
    [70, 2.4e9, 31.434],
  ])('W-15: %f dB at %d Hz equals %f m of free space', (db, hz, m) => {
    rel(freeSpaceEquivalentM(db, hz), m);
  });

  it('W-18: +10 dBm − 1.2 dB cable − 20 dB pad − ideal 2-way split − 0.3 dB adaptors = −14.51030 dBm; W-19: −10 and −13 dBm add to −8.235651 dBm', () => {
    const split = 10 * Math.log10(2); // ideal 2-way splitter, 3.0103 dB
    const result = analyseSetup({
      array: { elements: 2, spacingMm: 30 },
      sources: [
        { key: 'a', role: 'desired', frequencyHz: 1e9, powerDbm: 10 },
        { key: 'b', role: 'interferer', frequencyHz: 1.1e9, powerDbm: -13 },
      ],
      paths: [
        { source: 'a', channel: 0, segments: [{ kind: 'cable', lengthMm: 1000, velocityFactor: 0.7, lossDbPerM: 1.2, lossRefHz: 1e9 }, { kind: 'attenuator', lossDb: 20 }, { kind: 'splitter', lossDb: split }, { kind: 'adapter', lossDb: 0.3 }] },
        { source: 'a', channel: 1, segments: [{ kind: 'attenuator', lossDb: 20 }] },
        { source: 'b', channel: 0, segments: [{ kind: 'adapter', lossDb: 0 }] },
        { source: 'b', channel: 1, segments: [{ kind: 'adapter', lossDb: 0 }] },
      ],
      combiner: { delaysPs: [0, 0] },
      inputs: [{ channel: 0, maxInputDbm: 10 }, { channel: 1, maxInputDbm: -12 }],
    });
    dbClose(result.paths[0]!.powerAtInputDbm, -14.5103);
    // Channel 1: −10 dBm from a and −13 dBm from b, summed in mW.
    dbClose(result.inputs[1]!.totalPowerDbm, -8.235651);
    expect(result.warnings.filter((w) => w.code === 'input-overload').map((w) => w.channel)).toEqual([1]);
  });

  it('warns of grating lobes when the spacing exceeds half a wavelength (MathWorks "Grating Lobes", Stutzman & Thiele)', () => {
    const result = analyseSetup(doc(2, halfWaveMm(5e9) * 1.2, [{ key: 'a', role: 'desired', f: 5e9, delays: [0, 0] }], [0, 0]));
    expect(result.warnings.map((w) => w.code)).toContain('grating-lobes');
  });
});
