import { z } from 'zod';
import { connectors, genders } from '../domain/connectors.js';
import type { SolverPreference } from '../domain/solver.js';
import { MAX_ELEMENTS } from './analysis.js';

/** Most sources one request asks delays for. */
export const MAX_SOLVER_SOURCES = 4;
/** Most fixed segments every path shares (a cable into a splitter, the splitter, a pad…). */
export const MAX_SHARED_PARTS = 8;

const preferences = ['fewest-segments', 'lowest-loss', 'least-length'] as const satisfies readonly SolverPreference[];

const id = (what: string) => z.number({ error: `${what} must be a number` }).int({ error: `${what} must be a whole number` }).positive({ error: `${what} must be above 0` });
const positive = (what: string) => z.number({ error: `${what} must be a number` }).finite({ error: `${what} must be a finite number` }).positive({ error: `${what} must be above 0` });

const solverSourceSchema = z
  .strictObject({
    key: z.string({ error: 'Each source needs a key' }).trim().min(1, { error: 'Each source needs a key' }).max(40, { error: 'A key has at most 40 characters' }),
    frequencyHz: positive('Frequency').max(1e12, { error: 'Frequency must be at most 1 THz' }),
    /** Angle of arrival from broadside, degrees; positive when the path to input 1 is longer. */
    targetAngleDeg: z
      .number({ error: 'Target angle must be a number' })
      .finite({ error: 'Target angle must be a finite number' })
      .min(-90, { error: 'Target angle must be at least −90°' })
      .max(90, { error: 'Target angle must be at most +90°' })
      .optional(),
    /** Or the delay wanted at each input, ps (only the differences matter). */
    targetDelaysPs: z
      .array(z.number({ error: 'Target delays must be numbers' }).finite({ error: 'Target delays must be finite' }).min(-1e6).max(1e6, { error: 'Target delays must be within ±1 µs' }))
      .optional(),
  })
  .refine((s) => (s.targetAngleDeg === undefined) !== (s.targetDelaysPs === undefined), {
    error: 'Give either targetAngleDeg or targetDelaysPs for this source',
    path: ['targetAngleDeg'],
  });

/**
 * POST /api/solver: which parts on the shelf, chained per chip input, emulate the angles wanted. Delays in ps,
 * frequencies in Hz, lengths in mm. The booking (`bookingId`, or the booking of `setupId`) sets the time slot in
 * which parts held by other setups are left out.
 */
export const solverInputSchema = z
  .strictObject({
    bookingId: id('bookingId').optional(),
    /** The setup being edited: its own parts are not held against it, and its booking gives the slot. */
    setupId: id('setupId').optional(),
    array: z
      .strictObject({
        elements: z
          .number({ error: 'elements must be a number' })
          .int({ error: 'elements must be a whole number' })
          .min(2, { error: 'At least 2 inputs' })
          .max(MAX_ELEMENTS, { error: `At most ${MAX_ELEMENTS} inputs` }),
        spacingMm: positive('Element spacing').max(1e5, { error: 'Element spacing must be at most 100 m' }).optional(),
        spacingHalfWavelengthAtHz: positive('Half-wavelength frequency').max(1e12, { error: 'Half-wavelength frequency must be at most 1 THz' }).optional(),
      }, { error: 'Give the array: {"elements", "spacingMm" or "spacingHalfWavelengthAtHz"}' })
      .refine((a) => (a.spacingMm === undefined) !== (a.spacingHalfWavelengthAtHz === undefined), { error: 'Give either spacingMm or spacingHalfWavelengthAtHz', path: ['spacingMm'] }),
    sources: z
      .array(solverSourceSchema, { error: 'Give the sources as a list' })
      .min(1, { error: 'Give at least one source' })
      .max(MAX_SOLVER_SOURCES, { error: `At most ${MAX_SOLVER_SOURCES} sources` }),
    /** Largest error allowed on any path, ps. */
    tolerancePs: z
      .number({ error: 'Tolerance must be a number' })
      .finite({ error: 'Tolerance must be a finite number' })
      .positive({ error: 'Tolerance must be above 0 ps' })
      .max(100, { error: 'Tolerance must be at most 100 ps' })
      .default(0.5),
    /** Most segments in one path's chain (the shared segments do not count). */
    maxSegments: z.number({ error: 'maxSegments must be a number' }).int({ error: 'maxSegments must be a whole number' }).min(1, { error: 'At least 1 segment per path' }).max(4, { error: 'At most 4 segments per path' }).default(3),
    /** Segments every path shares and that stay fixed, in order from the source; never proposed for a chain. */
    sharedPartIds: z
      .array(id('A shared part id'), { error: 'sharedPartIds is a list of part ids' })
      .max(MAX_SHARED_PARTS, { error: `At most ${MAX_SHARED_PARTS} shared segments` })
      .refine((ids) => new Set(ids).size === ids.length, { error: 'A shared part is listed twice' })
      .default([]),
    /** The chip input every chain ends in. */
    inputConnector: z
      .strictObject({
        type: z.enum(connectors, { error: 'Connector type is sma, 2.92mm, 3.5mm, n, bnc or other' }),
        gender: z.enum(genders, { error: 'Gender is male or female' }),
      })
      .default({ type: 'sma', gender: 'female' }),
    /** Among proposals that meet the tolerance: fewest segments, lowest loss at each source's frequency, or least cable. */
    prefer: z.enum(preferences, { error: 'prefer is fewest-segments, lowest-loss or least-length' }).default('fewest-segments'),
    limit: z.number({ error: 'limit must be a number' }).int({ error: 'limit must be a whole number' }).min(1, { error: 'Ask for at least 1 proposal' }).max(20, { error: 'At most 20 proposals' }).default(5),
  })
  .superRefine((input, ctx) => {
    if (input.bookingId === undefined && input.setupId === undefined) {
      ctx.addIssue({ code: 'custom', path: ['bookingId'], message: 'Give the booking (bookingId) or the setup (setupId): its time slot decides which parts are free' });
    }
    const keys = input.sources.map((s) => s.key);
    keys.forEach((key, i) => {
      if (keys.indexOf(key) !== i) ctx.addIssue({ code: 'custom', path: ['sources', i, 'key'], message: `Source key ${key} is used twice` });
    });
    input.sources.forEach((s, i) => {
      if (s.targetDelaysPs && s.targetDelaysPs.length !== input.array.elements) {
        ctx.addIssue({ code: 'custom', path: ['sources', i, 'targetDelaysPs'], message: `Give one target delay per input (${input.array.elements})` });
      }
    });
  });
export type SolverInput = z.input<typeof solverInputSchema>;
export type SolverRequest = z.output<typeof solverInputSchema>;

const segmentSchema = z.object({
  partId: z.number(),
  tag: z.string(),
  kind: z.string(),
  reversed: z.boolean(),
  delayPs: z.number(),
  delaySource: z.enum(['measured', 'computed', 'entered']),
  lossDb: z.number(),
  connectors: z.string(),
});

const proposalSchema = z.object({
  rank: z.number(),
  meetsTolerance: z.boolean(),
  maxErrorPs: z.number(),
  totals: z.object({ segments: z.number(), lossDb: z.number(), lengthMm: z.number() }),
  sources: z.array(
    z.object({
      key: z.string(),
      frequencyHz: z.number(),
      targetAngleDeg: z.number().nullable(),
      angleDeg: z.number().nullable(),
      angleErrorDeg: z.number().nullable(),
      targetRelativeDelaysPs: z.array(z.number()),
      relativeDelaysPs: z.array(z.number()),
      maxErrorPs: z.number(),
    }),
  ),
  paths: z.array(
    z.object({
      source: z.string(),
      channel: z.number(),
      chain: z.array(segmentSchema),
      chainDelayPs: z.number(),
      delayPs: z.number(),
      targetDelayPs: z.number(),
      errorPs: z.number(),
      lossDb: z.number(),
      lengthMm: z.number(),
      segments: z.number(),
      cautions: z.array(z.string()),
    }),
  ),
});

/** A shared segment as the answer repeats it (the same on every path, before the chain). */
const sharedSegmentSchema = z.object({ partId: z.number(), tag: z.string(), kind: z.string(), delayPs: z.number(), delaySource: z.enum(['measured', 'computed', 'entered']), connectors: z.string() });

/** A part left out because another setup wires it in a booking that overlaps this one. */
export const solverHeldPartSchema = z.object({ partId: z.number(), tag: z.string(), setupId: z.number(), bookingId: z.number() });

/** The answer of POST /api/solver. */
export const solverAnswerSchema = z.object({
  feasible: z.boolean(),
  proposals: z.array(proposalSchema),
  /** When nothing meets the tolerance: what limits the closest proposal, in words. */
  limits: z.array(z.string()),
  search: z.object({ chains: z.number(), nodes: z.number(), complete: z.boolean() }),
  shared: z.array(sharedSegmentSchema),
  /** How many parts the chains could be built from. */
  candidates: z.number(),
  excluded: z.object({
    held: z.array(solverHeldPartSchema),
    /** Damaged or lost cables and adapters. */
    notOk: z.number(),
    /** Cables and adapters without a known delay (no length and velocity factor, no measured or entered delay). */
    noDelay: z.number(),
    /** Cables and adapters rated for a frequency range that leaves out a source's frequency. */
    outOfBand: z.number(),
  }),
});
export type SolverResponse = z.infer<typeof solverAnswerSchema>;
export type SolverProposal = SolverResponse['proposals'][number];
