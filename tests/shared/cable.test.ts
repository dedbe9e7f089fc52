import { describe, expect, it } from 'vitest';
import {
  cableElectrical,
  cableLossDb,
  delayPerMetrePs,
  dielectricPermittivity,
  freeSpaceLengthMm,
  lineDelayPs,
  velocityFactorFromPermittivity,
} from '../../shared/domain/cable.js';
import { SPEED_OF_LIGHT_M_PER_S } from '../../shared/domain/constants.js';
import { dbmToWatts, wattsToDbm } from '../../shared/domain/power.js';

/** Relative tolerance 1e-6 on times, lengths and ratios (RF-PRIMER §0: catches c = 3e8, which is 0.069 % off). */
const close = (actual: number | null, expected: number, rel = 1e-6) => {
  expect(actual).not.toBeNull();
  expect(Math.abs(actual! - expected) / Math.abs(expected)).toBeLessThan(rel);
};

describe('speed of light', () => {
  it('is 299 792 458 m/s exactly (BIPM, SI Brochure 9th ed., definition of the metre)', () => {
    expect(SPEED_OF_LIGHT_M_PER_S).toBe(299_792_458);
  });
});

describe('delay per metre 1/(VF·c)', () => {
  // RF-PRIMER W-01: computed at high precision from t = L/(VF·c) with exact c (BIPM), recomputed with mathjs.
  it.each([
    [0.66, 5054.001],
    [0.695, 4799.483],
    [0.7, 4765.201],
    [0.85, 3924.283],
    [1, 3335.641],
  ])('VF %f → %f ps/m (RF-PRIMER W-01)', (vf, psPerM) => {
    close(delayPerMetrePs(vf), psPerM);
  });
});

describe('velocity factor from the dielectric, VF = 1/√ε_r (Pozar §2.1; SSI Cable, Velocity of Propagation)', () => {
  it.each([
    [2.1, 0.690066], // PTFE, Standard Wire & Cable: "TFE 2.1, VP 69 %"
    [2.08, 0.693375], // PTFE, Pozar appendix (from memory)
    [2.25, 0.666667], // solid PE, Pozar appendix (from memory)
    [2.26, 0.66519], // solid PE, Standard Wire & Cable
    [1.38, 0.851257], // foamed PE class (from memory)
    [1.000536, 0.999732], // dry air, CRC Handbook
  ])('ε_r %f → VF %f (RF-PRIMER W-02)', (eps, vf) => {
    close(velocityFactorFromPermittivity(eps), vf);
  });

  it('uses PTFE 2.1 (Standard Wire & Cable) and air 1.000536 (CRC Handbook) as nominal permittivities', () => {
    expect(dielectricPermittivity.ptfe).toBe(2.1);
    expect(dielectricPermittivity.air).toBe(1.000536);
    expect(dielectricPermittivity.other).toBeNull();
  });
});

describe('cable delay t = L/(VF·c)', () => {
  it('0.5 m at VF 0.695 is 2.399742 ns (RF-PRIMER W-03)', () => {
    close(lineDelayPs(500, 0.695), 2399.742);
  });

  it('10 mm of extra cable at VF 0.695 is 47.99483 ps and equals 14.38849 mm of free space (RF-PRIMER W-04)', () => {
    const delay = lineDelayPs(10, 0.695);
    close(delay, 47.99483);
    close(freeSpaceLengthMm(delay), 14.38849);
  });

  it('0.15 m at VF 0.70 is 0.7147802 ns (RF-PRIMER W-05)', () => {
    close(lineDelayPs(150, 0.7), 714.7802);
  });

  it('1 m air line (ε_r 1.000536) is 3.336535 ns against 3.335641 ns in vacuum (RF-PRIMER W-20)', () => {
    close(cableElectrical({ lengthMm: 1000, dielectric: 'air' }).delayPs, 3336.535);
    close(lineDelayPs(1000, 1), 3335.641);
  });
});

describe('cableElectrical', () => {
  it('derives VF from the dielectric when no datasheet value is given', () => {
    const e = cableElectrical({ lengthMm: 500, dielectric: 'ptfe' });
    expect(e.velocityFactorSource).toBe('dielectric');
    close(e.velocityFactor, 0.690066); // W-02
    expect(e.delaySource).toBe('computed');
  });

  it('lets a datasheet VF win over the dielectric', () => {
    const e = cableElectrical({ lengthMm: 500, dielectric: 'ptfe', velocityFactor: 0.695 });
    expect(e.velocityFactorSource).toBe('datasheet');
    close(e.delayPs, 2399.742); // W-03
    close(e.delayPerMetrePs, 4799.483); // W-01
  });

  it('lets a measured delay override the computed one, and still reports the computed one', () => {
    const e = cableElectrical({ lengthMm: 500, dielectric: 'ptfe', velocityFactor: 0.695, measuredDelayPs: 2410 });
    expect(e.delayPs).toBe(2410);
    expect(e.delaySource).toBe('measured');
    close(e.computedDelayPs, 2399.742);
    close(e.freeSpaceLengthMm, (2410e-12 * SPEED_OF_LIGHT_M_PER_S) * 1e3);
  });

  it('gives no delay (not NaN) for an unknown dielectric without a datasheet VF, or a non-positive length', () => {
    expect(cableElectrical({ lengthMm: 500, dielectric: 'other' }).delayPs).toBeNull();
    expect(cableElectrical({ lengthMm: 0, dielectric: 'ptfe' }).delayPs).toBeNull();
  });
});

describe('cable loss scaled by √f', () => {
  it('0.5 dB/m at 1 GHz is 1.0 dB/m at 4 GHz (RF-PRIMER W-16, conductor-only √f model)', () => {
    close(cableLossDb(0.5, 1e9, 4e9, 1000), 1);
  });
});

describe('power units', () => {
  it('17 dBm is 50.11872 mW and 250 mW is 23.97940 dBm (RF-PRIMER W-17; Wikipedia, "DBm")', () => {
    close(dbmToWatts(17) * 1000, 50.11872);
    close(wattsToDbm(0.25), 23.9794);
  });
});
