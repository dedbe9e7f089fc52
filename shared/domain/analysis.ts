/**
 * What a bench setup emulates: per path delay, loss and power; per source the relative delays, the free-space
 * path difference and angle of arrival they emulate; the delay-and-sum response with the chip's delays; the
 * interferer rejection, the best null, the beam pattern and warnings. Pure: the editor previews with it and
 * the server stores its result. Conventions and sources: ../shared/RF-PRIMER.md §0–§7 (units in every name).
 */
import { cableElectrical, cableLossDb, type Dielectric } from './cable.js';
import { SPEED_OF_LIGHT_M_PER_S as C } from './constants.js';

export type SourceRole = 'desired' | 'interferer' | 'other';

export type Segment =
  | {
      kind: 'cable';
      lengthMm: number;
      velocityFactor?: number | null;
      dielectric?: Dielectric | null;
      measuredDelayPs?: number | null;
      lossDbPerM?: number | null;
      lossRefHz?: number | null;
      tag?: string;
    }
  | { kind: 'attenuator'; lossDb: number; delayPs?: number | null; tag?: string }
  | { kind: 'adapter' | 'splitter' | 'dc-block' | 'other'; lossDb?: number | null; delayPs?: number | null; tag?: string };

export interface AnalysisDocument {
  array: { elements: number; spacingMm?: number; spacingHalfWavelengthAtHz?: number };
  sources: { key: string; role: SourceRole; frequencyHz: number; powerDbm: number }[];
  paths: { source: string; channel: number; segments: Segment[] }[];
  combiner: { delaysPs: number[]; gains?: number[] };
  inputs?: { channel: number; maxInputDbm: number }[];
  nullSearch?: { interferer: string; maxDelayPs: number; stepPs: number };
}

export type WarningCode = 'input-overload' | 'input-near-limit' | 'non-physical-angle' | 'grating-lobes' | 'empty-path';
export interface AnalysisWarning {
  code: WarningCode;
  message: string;
  channel?: number;
  source?: string;
}

export interface PathResult {
  source: string;
  channel: number;
  delayPs: number;
  lossDb: number;
  powerAtInputDbm: number;
  /** Distance between isotropic antennas whose free-space loss equals this path's loss at the source frequency. */
  freeSpaceEquivalentM: number;
}

export interface SourceResult {
  key: string;
  role: SourceRole;
  frequencyHz: number;
  relativeDelaysPs: number[];
  pathDifferenceMm: number[];
  /** Emulated angle of arrival from broadside; positive when the path to channel 1 is longer. Null when non-physical. */
  angleDeg: number | null;
  physical: boolean;
  /** c·Δτ/d of the fitted inter-element delay: |value| > 1 cannot come from any real angle. */
  sinTheta: number;
  /** For more than two inputs: each channel's delay minus the straight-line fit, ps. */
  residualsPs: number[];
  phaseLagDeg: number[];
  responseDb: number;
}

export interface AnalysisResult {
  spacingMm: number;
  paths: PathResult[];
  inputs: { channel: number; totalPowerDbm: number; maxInputDbm: number | null; marginDb: number | null }[];
  sources: SourceResult[];
  rejectionDb: number | null;
  bestNull: { delaysPs: number[]; rejectionDb: number } | null;
  pattern: { angleDeg: number[]; responseDb: Record<string, number[]> };
  warnings: AnalysisWarning[];
}

/** Responses are reported down to this floor, so a perfect null stays a number in JSON. */
export const RESPONSE_FLOOR_DB = -300;
/** An input within this many dB of its maximum safe level is "near the limit" [common practice]. */
export const NEAR_LIMIT_DB = 3;

const dbToAmplitude = (db: number) => 10 ** (-db / 20);
const toDb = (ratio: number) => Math.max(RESPONSE_FLOOR_DB, 20 * Math.log10(ratio));

/** Wrap degrees to (−180, 180]. */
export function wrapDegrees(deg: number): number {
  const w = ((deg % 360) + 360) % 360;
  return w > 180 ? w - 360 : w;
}

/** Delay of one segment, ps: a cable's measured delay when recorded, else L/(VF·c); other parts their own. */
export function segmentDelayPs(segment: Segment): number {
  if (segment.kind === 'cable') {
    return cableElectrical({ lengthMm: segment.lengthMm, dielectric: segment.dielectric ?? 'other', velocityFactor: segment.velocityFactor, measuredDelayPs: segment.measuredDelayPs }).delayPs ?? 0;
  }
  return segment.delayPs ?? 0;
}

/** Loss of one segment at `frequencyHz`, dB: a cable's dB/m at f_ref scaled by √(f/f_ref) times its length. */
export function segmentLossDb(segment: Segment, frequencyHz: number): number {
  if (segment.kind === 'cable') {
    return segment.lossDbPerM != null && segment.lossRefHz != null ? cableLossDb(segment.lossDbPerM, segment.lossRefHz, frequencyHz, segment.lengthMm) : 0;
  }
  return segment.lossDb ?? 0;
}

/** Free-space path loss between isotropic antennas, dB: 20·log10(4π·d·f/c) (IEC 60050-705-08-05; MathWorks fspl). */
export function freeSpacePathLossDb(distanceM: number, frequencyHz: number): number {
  return 20 * Math.log10((4 * Math.PI * distanceM * frequencyHz) / C);
}

/** The distance whose free-space loss equals `lossDb` at `frequencyHz` (isotropic antennas): c/(4πf)·10^(L/20). */
export function freeSpaceEquivalentM(lossDb: number, frequencyHz: number): number {
  return (C / (4 * Math.PI * frequencyHz)) * 10 ** (lossDb / 20);
}

/**
 * Normalised delay-and-sum response, dB: 20·log10(|Σ w_n·exp(−j2πf·(τ_n + t_n))| / Σ w_n), w_n = a_n·g_n.
 * 0 dB for a perfectly aligned source, never above.
 */
export function delayAndSumDb(frequencyHz: number, delaysPs: number[], weights: number[]): number {
  let re = 0;
  let im = 0;
  let total = 0;
  for (let n = 0; n < delaysPs.length; n++) {
    const phase = -2 * Math.PI * frequencyHz * delaysPs[n]! * 1e-12;
    re += weights[n]! * Math.cos(phase);
    im += weights[n]! * Math.sin(phase);
    total += Math.abs(weights[n]!);
  }
  return total === 0 ? RESPONSE_FLOOR_DB : Math.min(0, toDb(Math.hypot(re, im) / total));
}

/** Least-squares line τ_n ≈ a + b·n over the channels; returns the slope b and each residual. */
function fitLine(delays: number[]): { slope: number; residuals: number[] } {
  const n = delays.length;
  const meanX = (n - 1) / 2;
  const meanY = delays.reduce((s, v) => s + v, 0) / n;
  let sxy = 0;
  let sxx = 0;
  delays.forEach((y, x) => {
    sxy += (x - meanX) * (y - meanY);
    sxx += (x - meanX) ** 2;
  });
  const slope = sxx === 0 ? 0 : sxy / sxx;
  const intercept = meanY - slope * meanX;
  return { slope, residuals: delays.map((y, x) => y - (intercept + slope * x)) };
}

/** Element spacing in mm: given, or half a wavelength at the stated frequency (d = c/(2f)). */
export function spacingOf(array: AnalysisDocument['array']): number {
  if (array.spacingMm !== undefined) return array.spacingMm;
  return (C / (2 * array.spacingHalfWavelengthAtHz!)) * 1e3;
}

interface PerSource {
  key: string;
  role: SourceRole;
  frequencyHz: number;
  pathDelaysPs: number[];
  amplitudes: number[];
}

function responseWith(s: PerSource, chipDelaysPs: number[], gains: number[]): number {
  const delays = s.pathDelaysPs.map((d, n) => d - s.pathDelaysPs[0]! + (chipDelaysPs[n]! - chipDelaysPs[0]!));
  return delayAndSumDb(s.frequencyHz, delays, s.amplitudes.map((a, n) => a * gains[n]!));
}

/** One source's channels as phasors b_n = w_n·exp(−j2πf·x_n) (x_n in ps), with Σ|w_n| for normalising. */
interface Phasors {
  frequencyHz: number;
  re: Float64Array;
  im: Float64Array;
  total: number;
}

function phasorsOf(frequencyHz: number, delaysPs: number[], weights: number[]): Phasors {
  const re = new Float64Array(delaysPs.length);
  const im = new Float64Array(delaysPs.length);
  let total = 0;
  for (let n = 0; n < delaysPs.length; n++) {
    const phase = -2 * Math.PI * frequencyHz * delaysPs[n]! * 1e-12;
    re[n] = weights[n]! * Math.cos(phase);
    im[n] = weights[n]! * Math.sin(phase);
    total += Math.abs(weights[n]!);
  }
  return { frequencyHz, re, im, total };
}

/** A power ratio |Σ|²/(Σ w)² in dB, with delayAndSumDb's floor and 0 dB ceiling (no square root needed). */
function powerRatioDb(ratio: number): number {
  return Math.min(0, Math.max(RESPONSE_FLOOR_DB, 10 * Math.log10(ratio)));
}

/**
 * The delay-and-sum response of `p` when channel n gets a further n·stepPs: |Σ b_n·zⁿ| / Σ|w_n| with
 * z = exp(−j2πf·stepPs), in dB, as delayAndSumDb would give it. The null search adds a delay that grows by the
 * same amount per channel, so Horner's rule needs one sine and cosine per candidate instead of one per channel;
 * the sum agrees with the direct one to rounding (its error grows like N·ε, as the direct sum's does).
 */
function progressiveResponseDb(p: Phasors, stepPs: number): number {
  if (p.total === 0) return RESPONSE_FLOOR_DB;
  const phase = -2 * Math.PI * p.frequencyHz * stepPs * 1e-12;
  const zRe = Math.cos(phase);
  const zIm = Math.sin(phase);
  let re = 0;
  let im = 0;
  for (let n = p.re.length - 1; n >= 0; n--) {
    const nextRe = re * zRe - im * zIm + p.re[n]!;
    im = re * zIm + im * zRe + p.im[n]!;
    re = nextRe;
  }
  return powerRatioDb((re * re + im * im) / (p.total * p.total));
}

/**
 * progressiveResponseDb for +stepPs and −stepPs at once, into out[plus] and out[minus]: the pattern at θ and −θ.
 * With c_n = a_n + j·b_n, A = Σ a_n·zⁿ and B = Σ b_n·zⁿ (real coefficients, Horner's rule) give
 * Σ c_n·zⁿ = A + j·B, and since z̄ is the step's other sign, |Σ c_n·z̄ⁿ| = |Σ c̄_n·zⁿ| = |A − j·B|.
 * One sine and cosine and two real-coefficient chains serve two angles: the pattern dominates the analysis
 * (181 angles per source), and this halves its trigonometry.
 */
function mirroredResponsesDb(p: Phasors, stepPs: number, out: number[], plus: number, minus: number): void {
  if (p.total === 0) {
    out[plus] = RESPONSE_FLOOR_DB;
    out[minus] = RESPONSE_FLOOR_DB;
    return;
  }
  const phase = -2 * Math.PI * p.frequencyHz * stepPs * 1e-12;
  const zRe = Math.cos(phase);
  const zIm = Math.sin(phase);
  let aRe = 0;
  let aIm = 0;
  let bRe = 0;
  let bIm = 0;
  for (let n = p.re.length - 1; n >= 0; n--) {
    const nextARe = aRe * zRe - aIm * zIm + p.re[n]!;
    aIm = aRe * zIm + aIm * zRe;
    aRe = nextARe;
    const nextBRe = bRe * zRe - bIm * zIm + p.im[n]!;
    bIm = bRe * zIm + bIm * zRe;
    bRe = nextBRe;
  }
  const total2 = p.total * p.total;
  out[plus] = powerRatioDb(((aRe - bIm) ** 2 + (aIm + bRe) ** 2) / total2);
  out[minus] = powerRatioDb(((aRe + bIm) ** 2 + (aIm - bRe) ** 2) / total2);
}

/** The pattern's angles, whole degrees from −90° to 90°, and their sines (the same for every analysis). */
const PATTERN_ANGLES_DEG = Array.from({ length: 181 }, (_, i) => i - 90);
const PATTERN_SINES = PATTERN_ANGLES_DEG.map((deg) => Math.sin((deg * Math.PI) / 180));

/**
 * Analyse a setup document whose references are resolved (every segment carries its own values).
 * The caller validates the document's shape (shared/schemas/analysis.ts); this assumes every
 * source has one path per channel.
 */
export function analyseSetup(doc: AnalysisDocument): AnalysisResult {
  const n = doc.array.elements;
  const d = spacingOf(doc.array);
  const gains = doc.combiner.gains ?? Array.from({ length: n }, () => 1);
  const chip = doc.combiner.delaysPs;
  const warnings: AnalysisWarning[] = [];

  const paths: PathResult[] = [];
  // Each source's segments by channel; the first path given for a channel wins, as a search would find it.
  const segmentsOf = new Map<string, Segment[][]>();
  for (const p of doc.paths) {
    const byChannel = segmentsOf.get(p.source) ?? [];
    byChannel[p.channel] ??= p.segments;
    segmentsOf.set(p.source, byChannel);
  }
  const inputMw = new Array<number>(n).fill(0);
  const perSource: PerSource[] = doc.sources.map((source) => {
    const pathDelaysPs: number[] = [];
    const amplitudes: number[] = [];
    const byChannel = segmentsOf.get(source.key) ?? [];
    for (let channel = 0; channel < n; channel++) {
      const segments = byChannel[channel] ?? [];
      if (segments.length === 0) {
        warnings.push({ code: 'empty-path', source: source.key, channel, message: `The path of ${source.key} to input ${channel} has no segments: it is taken as 0 ps and 0 dB.` });
      }
      let delayPs = 0;
      let lossDb = 0;
      for (const segment of segments) {
        delayPs += segmentDelayPs(segment);
        lossDb += segmentLossDb(segment, source.frequencyHz);
      }
      const powerAtInputDbm = source.powerDbm - lossDb;
      paths.push({ source: source.key, channel, delayPs, lossDb, powerAtInputDbm, freeSpaceEquivalentM: freeSpaceEquivalentM(lossDb, source.frequencyHz) });
      inputMw[channel] += 10 ** (powerAtInputDbm / 10);
      pathDelaysPs.push(delayPs);
      amplitudes.push(dbToAmplitude(lossDb));
    }
    return { key: source.key, role: source.role, frequencyHz: source.frequencyHz, pathDelaysPs, amplitudes };
  });

  // Power at each chip input: all sources summed in mW (incoherent tones at different frequencies).
  const inputs = Array.from({ length: n }, (_, channel) => {
    const mw = inputMw[channel]!;
    const totalPowerDbm = mw > 0 ? 10 * Math.log10(mw) : RESPONSE_FLOOR_DB;
    const limit = doc.inputs?.find((i) => i.channel === channel)?.maxInputDbm ?? null;
    const marginDb = limit === null ? null : limit - totalPowerDbm;
    if (marginDb !== null && marginDb < 0) {
      warnings.push({ code: 'input-overload', channel, message: `Input ${channel} receives ${totalPowerDbm.toFixed(1)} dBm, above its maximum safe level of ${limit} dBm. Reduce the source power or add attenuation before connecting.` });
    } else if (marginDb !== null && marginDb < NEAR_LIMIT_DB) {
      warnings.push({ code: 'input-near-limit', channel, message: `Input ${channel} receives ${totalPowerDbm.toFixed(1)} dBm, within ${NEAR_LIMIT_DB} dB of its maximum safe level of ${limit} dBm.` });
    }
    return { channel, totalPowerDbm, maxInputDbm: limit, marginDb };
  });

  const sources: SourceResult[] = perSource.map((s) => {
    const relativeDelaysPs = s.pathDelaysPs.map((t) => t - s.pathDelaysPs[0]!);
    const { slope, residuals } = fitLine(relativeDelaysPs);
    const sinTheta = (C * slope * 1e-12) / (d * 1e-3);
    const physical = Math.abs(sinTheta) <= 1;
    if (!physical) {
      warnings.push({ code: 'non-physical-angle', source: s.key, message: `The delays of ${s.key} (c·Δτ/d = ${sinTheta.toFixed(3)}) exceed what any real angle could produce for ${d.toFixed(2)} mm spacing.` });
    }
    if (d * 1e-3 > C / (2 * s.frequencyHz) * (1 + 1e-12)) {
      warnings.push({ code: 'grating-lobes', source: s.key, message: `The spacing ${d.toFixed(2)} mm is more than half a wavelength (${((C / (2 * s.frequencyHz)) * 1e3).toFixed(2)} mm) at ${s.frequencyHz / 1e9} GHz: grating lobes can appear.` });
    }
    return {
      key: s.key,
      role: s.role,
      frequencyHz: s.frequencyHz,
      relativeDelaysPs,
      pathDifferenceMm: relativeDelaysPs.map((t) => C * t * 1e-12 * 1e3),
      angleDeg: physical ? (Math.asin(sinTheta) * 180) / Math.PI : null,
      physical,
      sinTheta,
      residualsPs: n > 2 ? residuals : relativeDelaysPs.map(() => 0),
      phaseLagDeg: relativeDelaysPs.map((t) => wrapDegrees(360 * s.frequencyHz * t * 1e-12)),
      responseDb: responseWith(s, chip, gains),
    };
  });

  const desired = perSource.filter((s) => s.role === 'desired');
  const interferers = perSource.filter((s) => s.role === 'interferer');
  const rejection = (chipDelays: number[]) =>
    desired.length === 1 && interferers.length === 1 ? responseWith(desired[0]!, chipDelays, gains) - responseWith(interferers[0]!, chipDelays, gains) : null;

  let bestNull: AnalysisResult['bestNull'] = null;
  const target = doc.nullSearch && perSource.find((s) => s.key === doc.nullSearch!.interferer);
  if (doc.nullSearch && target && n > 1) {
    const { maxDelayPs, stepPs } = doc.nullSearch;
    const want = desired.length === 1 ? desired[0]! : null;
    // A range that is a whole number of steps in decimal (0.3 ps in 0.1 ps steps) is a hair short of it in
    // binary (2.9999999999999996): without the allowance its last step on each side would be lost.
    const steps = Math.floor((maxDelayPs / (n - 1) / stepPs) * (1 + 1e-9));
    // Each source's channels with their path delays and weights; the search only adds n·Δ to channel n.
    const relativePhasors = (s: PerSource) =>
      phasorsOf(s.frequencyHz, s.pathDelaysPs.map((t) => t - s.pathDelaysPs[0]!), s.amplitudes.map((a, i) => a * gains[i]!));
    const wantPhasors = want && relativePhasors(want);
    const targetPhasors = relativePhasors(target);
    let bestK = -steps;
    let bestScore = -Infinity;
    for (let k = -steps; k <= steps; k++) {
      const delta = k * stepPs;
      const score = (wantPhasors ? progressiveResponseDb(wantPhasors, delta) : 0) - progressiveResponseDb(targetPhasors, delta);
      if (k === -steps || score > bestScore + 1e-12) {
        bestK = k;
        bestScore = score;
      }
    }
    // Progressive delays t_n = n·Δ (or (N−1−n)·|Δ| for the other direction), each within [0, maxDelayPs].
    const delta = bestK * stepPs;
    const delaysPs = Array.from({ length: n }, (_, i) => Math.min(maxDelayPs, delta >= 0 ? i * delta : (n - 1 - i) * -delta));
    // Reported as the setup with these chip delays evaluates, so applying them gives exactly this rejection.
    bestNull = { delaysPs, rejectionDb: (want ? responseWith(want, delaysPs, gains) : 0) - responseWith(target, delaysPs, gains) };
  }

  // Beam pattern with the current chip delays: a plane wave from θ reaches element n after n·d·sinθ/c, so each
  // angle adds n·(d·sinθ/c) to channel n; ±θ are evaluated together (index 90 + k is +k°, 90 − k is −k°).
  const psPerUnitSine = ((d * 1e-3) / C) * 1e12;
  const responseDb: Record<string, number[]> = {};
  for (const s of doc.sources) {
    const chipPhasors = phasorsOf(s.frequencyHz, chip.slice(0, n).map((t) => t - chip[0]!), gains);
    const values = new Array<number>(PATTERN_ANGLES_DEG.length);
    for (let k = 0; k <= 90; k++) mirroredResponsesDb(chipPhasors, psPerUnitSine * PATTERN_SINES[90 + k]!, values, 90 + k, 90 - k);
    responseDb[s.key] = values;
  }
  const angleDeg = PATTERN_ANGLES_DEG.slice();

  return { spacingMm: d, paths, inputs, sources, rejectionDb: rejection(chip), bestNull, pattern: { angleDeg, responseDb }, warnings };
}
