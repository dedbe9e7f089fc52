// Random but valid analysis documents for the property and cross-check tests (fast-check), and the rounding
// bounds those tests compare with. Every document these build passes shared/schemas/analysis.ts.
import fc from 'fast-check';
import type { AnalysisDocument, Segment, SourceRole } from '../../shared/domain/analysis.js';
import { SPEED_OF_LIGHT_M_PER_S as C } from '../../shared/domain/constants.js';

/** A finite double in [min, max]. */
export const between = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

/** A cable: its delay from a datasheet velocity factor, a known dielectric or a measured delay; loss optional. */
export const cableArb: fc.Arbitrary<Segment> = fc
  .record({
    lengthMm: between(1, 3000),
    delayFrom: fc.oneof(
      fc.record({ velocityFactor: between(0.6, 1) }),
      fc.record({ dielectric: fc.constantFrom('ptfe' as const, 'solid-pe' as const, 'foam-pe' as const, 'air' as const) }),
      fc.record({ measuredDelayPs: between(1, 15_000) }),
    ),
    loss: fc.option(fc.record({ lossDbPerM: between(0.01, 3), lossRefHz: between(1e8, 2e10) }), { nil: undefined }),
  })
  .map(({ lengthMm, delayFrom, loss }) => ({ kind: 'cable', lengthMm, ...delayFrom, ...loss }));

const attenuatorArb: fc.Arbitrary<Segment> = fc
  .record({ lossDb: between(0.1, 40), delayPs: fc.option(between(1, 100), { nil: undefined }) })
  .map(({ lossDb, delayPs }) => ({ kind: 'attenuator', lossDb, ...(delayPs === undefined ? {} : { delayPs }) }));

const passiveArb: fc.Arbitrary<Segment> = fc.record({
  kind: fc.constantFrom('adapter' as const, 'splitter' as const, 'dc-block' as const, 'other' as const),
  lossDb: between(0.01, 15),
  delayPs: between(0.5, 200),
});

export const segmentArb: fc.Arbitrary<Segment> = fc.oneof(cableArb, attenuatorArb, passiveArb);

/** Frequencies of an RF IC lab's bench: 100 MHz to 100 GHz. */
export const frequencyArb = between(1e8, 1e11);

interface SourceDraft {
  frequencyHz: number;
  powerDbm: number;
  /** segments[channel] */
  segments: Segment[][];
}

/**
 * One source's wiring. `free`: every path its own 1–4 random segments (mostly non-physical for small
 * spacings). `steered`: the same parts on every path plus a phase cable n·d·sinθ·VF longer on channel n,
 * which emulates the angle θ; lossless phase cables when `equalLoss`, so every path has the same loss.
 */
function sourceArb(elements: number, spacingMm: number, { steeredOnly = false, equalLoss = false, integerAngle = false } = {}): fc.Arbitrary<SourceDraft & { angleDeg: number | null }> {
  const free = fc.record({
    frequencyHz: frequencyArb,
    powerDbm: between(-60, 20),
    segments: fc.array(fc.array(segmentArb, { minLength: 1, maxLength: 4 }), { minLength: elements, maxLength: elements }),
  }).map((s) => ({ ...s, angleDeg: null }));
  const steered = fc
    .record({
      frequencyHz: frequencyArb,
      powerDbm: between(-60, 20),
      common: fc.array(segmentArb, { maxLength: 3 }),
      angleDeg: integerAngle ? fc.integer({ min: -80, max: 80 }) : between(-85, 85),
      velocityFactor: between(0.6, 1),
      baseMm: between(10, 1000),
      lossDbPerM: equalLoss ? fc.constant(undefined) : fc.option(between(0.01, 3), { nil: undefined }),
    })
    .map(({ frequencyHz, powerDbm, common, angleDeg, velocityFactor, baseMm, lossDbPerM }) => {
      const step = spacingMm * Math.sin((angleDeg * Math.PI) / 180) * velocityFactor;
      // The base covers the most negative extra, so every phase cable is longer than baseMm.
      const offset = baseMm + (elements - 1) * spacingMm * velocityFactor;
      const segments = Array.from({ length: elements }, (_, n) => [
        ...common,
        { kind: 'cable' as const, lengthMm: offset + n * step, velocityFactor, ...(lossDbPerM === undefined ? {} : { lossDbPerM, lossRefHz: 1e9 }) },
      ]);
      return { frequencyHz, powerDbm, segments, angleDeg };
    });
  return steeredOnly ? steered : fc.oneof(free, steered);
}

export interface SetupOptions {
  minElements?: number;
  maxElements?: number;
  minSources?: number;
  maxSources?: number;
  /** Include a null search (its target preferably the interferer). */
  nullSearch?: boolean;
  /** Largest number of grid points on each side of zero in the null search. */
  maxGridSteps?: number;
}

export interface GeneratedSetup {
  doc: AnalysisDocument;
  spacingMm: number;
  /** The angle each steered source was wired to emulate, or null for free wiring. */
  wiredAngleDeg: (number | null)[];
  /** The null search's grid in tenths of a ps, exactly: Δ = k·stepTenths/10 for |k|·(N−1)·stepTenths ≤ maxTenths. */
  grid: { stepTenths: number; maxTenths: number } | null;
}

const canonicalRoles: SourceRole[] = ['desired', 'interferer', 'other', 'other'];

/** Spacing as given in mm (1–200) or as half a wavelength at 1–100 GHz. */
const spacingArb = fc.oneof(
  between(1, 200).map((mm) => ({ array: { spacingMm: mm }, spacingMm: mm })),
  between(1e9, 1e11).map((hz) => ({ array: { spacingHalfWavelengthAtHz: hz }, spacingMm: (C / (2 * hz)) * 1e3 })),
);

function gridArb(elements: number, maxGridSteps: number) {
  return fc
    .record({
      stepTenths: fc.integer({ min: 1, max: 100 }),
      steps: fc.integer({ min: 0, max: maxGridSteps }),
      // Zero makes the range an exact multiple of the step, the case where rounding could lose the last point.
      remainder: fc.oneof(fc.constant(0), fc.double({ min: 0, max: 0.999, noNaN: true })),
    })
    .map(({ stepTenths, steps, remainder }) => {
      const span = (elements - 1) * stepTenths;
      const maxTenths = Math.max(1, steps * span + Math.floor(remainder * span));
      return { stepTenths, maxTenths };
    });
}

/** A valid setup document of 2–16 inputs and 1–4 sources (bounds adjustable). */
export function setupArb(options: SetupOptions = {}): fc.Arbitrary<GeneratedSetup> {
  const { minElements = 2, maxElements = 16, minSources = 1, maxSources = 4, nullSearch = false, maxGridSteps = 40 } = options;
  return fc
    .record({ elements: fc.integer({ min: minElements, max: maxElements }), sourceCount: fc.integer({ min: minSources, max: maxSources }), spacing: spacingArb })
    .chain(({ elements, sourceCount, spacing }) =>
      fc.record({
        elements: fc.constant(elements),
        spacing: fc.constant(spacing),
        sources: fc.array(sourceArb(elements, spacing.spacingMm), { minLength: sourceCount, maxLength: sourceCount }),
        roles: fc.oneof(
          { arbitrary: fc.constant(canonicalRoles.slice(0, sourceCount)), weight: 3 },
          { arbitrary: fc.array(fc.constantFrom<SourceRole>('desired', 'interferer', 'other'), { minLength: sourceCount, maxLength: sourceCount }), weight: 1 },
        ),
        chipPs: fc.array(between(0, 2000), { minLength: elements, maxLength: elements }),
        gains: fc.option(fc.array(fc.oneof({ arbitrary: fc.constant(0), weight: 1 }, { arbitrary: between(0.01, 10), weight: 6 }), { minLength: elements, maxLength: elements }), { nil: undefined }),
        limitsDbm: fc.option(fc.array(between(-30, 20), { minLength: elements, maxLength: elements }), { nil: undefined }),
        search: nullSearch ? fc.record({ grid: gridArb(elements, maxGridSteps), target: fc.nat(), preferInterferer: fc.boolean() }) : fc.constant(null),
      }),
    )
    .map(({ elements, spacing, sources, roles, chipPs, gains, limitsDbm, search }) => {
      const keys = sources.map((_, i) => `s${i}`);
      const interferer = roles.indexOf('interferer');
      const target = search ? (search.preferInterferer && interferer >= 0 ? interferer : search.target % sources.length) : 0;
      const doc: AnalysisDocument = {
        array: { elements, ...spacing.array },
        sources: sources.map((s, i) => ({ key: keys[i]!, role: roles[i]!, frequencyHz: s.frequencyHz, powerDbm: s.powerDbm })),
        paths: sources.flatMap((s, i) => s.segments.map((segments, channel) => ({ source: keys[i]!, channel, segments }))),
        combiner: { delaysPs: chipPs, ...(gains ? { gains } : {}) },
        ...(limitsDbm ? { inputs: limitsDbm.map((maxInputDbm, channel) => ({ channel, maxInputDbm })) } : {}),
        ...(search ? { nullSearch: { interferer: keys[target]!, maxDelayPs: search.grid.maxTenths / 10, stepPs: search.grid.stepTenths / 10 } } : {}),
      };
      return { doc, spacingMm: spacing.spacingMm, wiredAngleDeg: sources.map((s) => s.angleDeg), grid: search?.grid ?? null };
    });
}

/**
 * A null-search setup whose pattern can be compared with the interferer's response: the target is a steered
 * source with equal losses on every path, emulating a whole-degree angle (so the 1° pattern has a sample
 * there); the other sources have role `other`, so the search minimises the interferer's response alone.
 */
export function interfererOnlyArb({ minElements = 2, maxElements = 16, maxGridSteps = 40 } = {}): fc.Arbitrary<GeneratedSetup & { angleDeg: number }> {
  return fc
    .record({ elements: fc.integer({ min: minElements, max: maxElements }), others: fc.integer({ min: 0, max: 2 }), spacing: spacingArb })
    .chain(({ elements, others, spacing }) =>
      fc.record({
        elements: fc.constant(elements),
        spacing: fc.constant(spacing),
        target: sourceArb(elements, spacing.spacingMm, { steeredOnly: true, equalLoss: true, integerAngle: true }),
        others: fc.array(sourceArb(elements, spacing.spacingMm), { minLength: others, maxLength: others }),
        chipPs: fc.array(between(0, 2000), { minLength: elements, maxLength: elements }),
        gains: fc.option(fc.array(between(0.05, 10), { minLength: elements, maxLength: elements }), { nil: undefined }),
        grid: gridArb(elements, maxGridSteps),
      }),
    )
    .map(({ elements, spacing, target, others, chipPs, gains, grid }) => {
      const all = [target, ...others];
      const keys = ['jam', ...others.map((_, i) => `o${i}`)];
      const doc: AnalysisDocument = {
        array: { elements, ...spacing.array },
        sources: all.map((s, i) => ({ key: keys[i]!, role: i === 0 ? 'interferer' : 'other', frequencyHz: s.frequencyHz, powerDbm: s.powerDbm })),
        paths: all.flatMap((s, i) => s.segments.map((segments, channel) => ({ source: keys[i]!, channel, segments }))),
        combiner: { delaysPs: chipPs, ...(gains ? { gains } : {}) },
        nullSearch: { interferer: 'jam', maxDelayPs: grid.maxTenths / 10, stepPs: grid.stepTenths / 10 },
      };
      return { doc, spacingMm: spacing.spacingMm, wiredAngleDeg: all.map((s) => s.angleDeg), grid, angleDeg: target.angleDeg! };
    });
}

// ---------------------------------------------------------------------------------------------------------
// Rounding bounds. The engine works in doubles, so "unchanged" means "unchanged up to what double rounding can
// move": a response's amplitude ratio |Σ w·e^{−jψ}|/Σ w moves by at most about ε·(|ψ|max + N) when its phases
// ψ carry relative rounding ε and the sum of N terms adds its own. In dB that is tiny above about −60 dB, but
// unbounded at a null (20·log10 of a rounding-sized residual), so a fixed dB tolerance cannot hold there.

export const EPS = Number.EPSILON;

/** The amplitude-ratio bound for phases up to `maxPhaseRad` over `elements` terms, with a ×64 safety margin. */
export function amplitudeBound(maxPhaseRad: number, elements: number): number {
  return 64 * EPS * (maxPhaseRad + elements);
}

/** The largest |phase| the engine forms for a source: 2π·f·(largest path delay + largest chip delay). */
export function maxPhaseRad(doc: AnalysisDocument, sourceKey: string, pathDelaysPs: number[], extraPs = 0): number {
  const source = doc.sources.find((s) => s.key === sourceKey)!;
  const chip = Math.max(0, ...doc.combiner.delaysPs);
  return 2 * Math.PI * source.frequencyHz * (Math.max(0, ...pathDelaysPs.map(Math.abs)) + chip + extraPs) * 1e-12;
}

const amplitudeOf = (db: number) => 10 ** (db / 20);

/**
 * Two responses agree: within 1e-9 dB, or, where a response is so deep that 1e-9 dB is finer than double
 * rounding, their amplitude ratios within `bound` of each other.
 */
export function responsesAgree(a: number, b: number, bound: number): boolean {
  return Math.abs(a - b) <= 1e-9 || Math.abs(amplitudeOf(a) - amplitudeOf(b)) <= bound;
}

/** The dB interval a response can be in when its amplitude ratio is known to within `bound`. */
export function responseInterval(db: number, bound: number): [number, number] {
  const a = amplitudeOf(db);
  const floor = 1e-15; // −300 dB, the engine's reporting floor
  return [20 * Math.log10(Math.max(floor, a - bound)), Math.min(0, 20 * Math.log10(a + bound))];
}
