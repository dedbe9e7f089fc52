import { SPEED_OF_LIGHT_M_PER_S } from './constants.js';

export const dielectrics = ['ptfe', 'solid-pe', 'foam-pe', 'air', 'other'] as const;
export type Dielectric = (typeof dielectrics)[number];

export const dielectricLabels: Record<Dielectric, string> = {
  ptfe: 'PTFE (solid)',
  'solid-pe': 'Solid polyethylene',
  'foam-pe': 'Foamed polyethylene',
  air: 'Air',
  other: 'Other (enter the velocity factor)',
};

/**
 * Nominal relative permittivity ε_r of each dielectric, used when no datasheet velocity factor is entered.
 * PTFE 2.1 (Standard Wire & Cable design tables, "TFE Teflon 2.1, VP 69 %"); solid PE 2.25 (Pozar,
 * Microwave Engineering 4th ed., appendix, from memory; Standard Wire & Cable lists 2.26); foamed PE 1.38
 * (typical of the 10 mm foam-PE class, from memory; it depends on the gas fraction, so prefer the datasheet);
 * air 1.000536 (CRC Handbook, permittivity of gases, dry air at 20 °C and 101.325 kPa).
 * `other` has no nominal value: the velocity factor must come from the datasheet.
 */
export const dielectricPermittivity: Record<Dielectric, number | null> = {
  ptfe: 2.1,
  'solid-pe': 2.25,
  'foam-pe': 1.38,
  air: 1.000536,
  other: null,
};

/** Velocity factor of a TEM line with a non-magnetic dielectric: VF = 1/√ε_r (Pozar §2.1; SSI Cable, "Velocity of Propagation"). */
export function velocityFactorFromPermittivity(relativePermittivity: number): number {
  return 1 / Math.sqrt(relativePermittivity);
}

/** Propagation delay of a line, ps: t = L/(VF·c). */
export function lineDelayPs(lengthMm: number, velocityFactor: number): number {
  return (lengthMm * 1e-3) / (velocityFactor * SPEED_OF_LIGHT_M_PER_S) * 1e12;
}

/** Delay per metre of line, ps/m: 1/(VF·c). */
export function delayPerMetrePs(velocityFactor: number): number {
  return 1e12 / (velocityFactor * SPEED_OF_LIGHT_M_PER_S);
}

/** Free-space path length that a delay equals, mm: c·t. */
export function freeSpaceLengthMm(delayPs: number): number {
  return SPEED_OF_LIGHT_M_PER_S * delayPs * 1e-12 * 1e3;
}

/**
 * Loss of a cable at frequency f, dB: the datasheet loss per metre at f_ref scaled by √(f/f_ref) (skin effect
 * dominates in coax; AC6LA "BestFit" and SSI Cable "Attenuation" model conductor loss as k1·√f), times the length.
 */
export function cableLossDb(lossDbPerM: number, lossRefHz: number, frequencyHz: number, lengthMm: number): number {
  return lossDbPerM * Math.sqrt(frequencyHz / lossRefHz) * (lengthMm * 1e-3);
}

export interface CableFacts {
  lengthMm: number;
  dielectric: Dielectric;
  /** From the datasheet; when given it wins over the dielectric's nominal value. */
  velocityFactor?: number | null;
  /** Measured electrical delay (e.g. on a network analyzer); when given it overrides the computed delay. */
  measuredDelayPs?: number | null;
}

export interface CableElectrical {
  /** The velocity factor in use, or null when neither a datasheet value nor a known dielectric gives one. */
  velocityFactor: number | null;
  velocityFactorSource: 'datasheet' | 'dielectric' | null;
  /** L/(VF·c), ps. */
  computedDelayPs: number | null;
  /** The delay to use: the measured one when recorded, else the computed one. */
  delayPs: number | null;
  delaySource: 'measured' | 'computed' | null;
  delayPerMetrePs: number | null;
  /** c times delayPs: the free-space path this cable's delay stands for. */
  freeSpaceLengthMm: number | null;
}

/** Everything a cable's delay depends on, in one place; the parts form previews it and the server stores it. */
export function cableElectrical(cable: CableFacts): CableElectrical {
  const eps = dielectricPermittivity[cable.dielectric];
  const datasheet = cable.velocityFactor ?? null;
  const velocityFactor = datasheet ?? (eps === null ? null : velocityFactorFromPermittivity(eps));
  const velocityFactorSource = datasheet !== null ? 'datasheet' : velocityFactor !== null ? 'dielectric' : null;
  const valid = velocityFactor !== null && velocityFactor > 0 && velocityFactor <= 1 && cable.lengthMm > 0;
  const computedDelayPs = valid ? lineDelayPs(cable.lengthMm, velocityFactor) : null;
  const measured = cable.measuredDelayPs ?? null;
  const delayPs = measured ?? computedDelayPs;
  return {
    velocityFactor,
    velocityFactorSource,
    computedDelayPs,
    delayPs,
    delaySource: measured !== null ? 'measured' : computedDelayPs !== null ? 'computed' : null,
    delayPerMetrePs: velocityFactor !== null && velocityFactor > 0 && velocityFactor <= 1 ? delayPerMetrePs(velocityFactor) : null,
    freeSpaceLengthMm: delayPs === null ? null : freeSpaceLengthMm(delayPs),
  };
}
