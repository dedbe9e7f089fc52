import { z } from 'zod';
import { dielectrics } from '../domain/cable.js';

/** Largest array a setup describes (chip inputs). */
export const MAX_ELEMENTS = 16;

const positive = (what: string) => z.number({ error: `${what} must be a number` }).finite().positive({ error: `${what} must be above 0` });
const optionalNonNegative = (what: string) => z.number({ error: `${what} must be a number` }).finite().min(0, { error: `${what} cannot be negative` }).nullish();

const cableSegment = z
  .strictObject({
    kind: z.literal('cable'),
    lengthMm: positive('Length'),
    velocityFactor: z.number({ error: 'Velocity factor must be a number' }).gt(0, { error: 'Velocity factor must be above 0' }).max(1, { error: 'Velocity factor must be at most 1' }).nullish(),
    dielectric: z.enum(dielectrics, { error: 'Dielectric is ptfe, solid-pe, foam-pe, air or other' }).nullish(),
    measuredDelayPs: positive('Measured delay').nullish(),
    lossDbPerM: optionalNonNegative('Loss per metre'),
    lossRefHz: positive('Loss reference frequency').nullish(),
    tag: z.string().max(40).optional(),
  })
  .superRefine((s, ctx) => {
    if (s.velocityFactor == null && (s.dielectric == null || s.dielectric === 'other') && s.measuredDelayPs == null) {
      ctx.addIssue({ code: 'custom', path: ['velocityFactor'], message: 'Give the velocity factor, a known dielectric or a measured delay' });
    }
    if (s.lossDbPerM != null && s.lossRefHz == null) ctx.addIssue({ code: 'custom', path: ['lossRefHz'], message: 'Give the frequency at which the loss per metre is stated' });
  });

const attenuatorSegment = z.strictObject({ kind: z.literal('attenuator'), lossDb: z.number({ error: 'Attenuation must be a number' }).finite().min(0, { error: 'Attenuation cannot be negative' }), delayPs: optionalNonNegative('Delay'), tag: z.string().max(40).optional() });
const passiveSegment = z.strictObject({
  kind: z.enum(['adapter', 'splitter', 'dc-block', 'other']),
  lossDb: optionalNonNegative('Loss'),
  delayPs: optionalNonNegative('Delay'),
  tag: z.string().max(40).optional(),
});
/** A part of the inventory by id; the server fills in its values. */
const partSegment = z.strictObject({ partId: z.number({ error: 'partId must be a number' }).int().positive() });

export const segmentInputSchema = z.union([partSegment, cableSegment, attenuatorSegment, passiveSegment], {
  error: 'A segment is {"partId"} or has kind cable, attenuator, adapter, splitter, dc-block or other',
});
export type SegmentInput = z.infer<typeof segmentInputSchema>;

/** POST /api/analysis: an unsaved setup document. Lengths in mm, delays in ps, frequencies in Hz, powers in dBm. */
export const analysisInputSchema = z
  .strictObject({
    array: z
      .strictObject({
        elements: z.number({ error: 'elements must be a number' }).int({ error: 'elements must be a whole number' }).min(2, { error: 'At least 2 inputs' }).max(MAX_ELEMENTS, { error: `At most ${MAX_ELEMENTS} inputs` }),
        spacingMm: positive('Element spacing').optional(),
        spacingHalfWavelengthAtHz: positive('Half-wavelength frequency').optional(),
      })
      .refine((a) => (a.spacingMm === undefined) !== (a.spacingHalfWavelengthAtHz === undefined), { error: 'Give either spacingMm or spacingHalfWavelengthAtHz', path: ['spacingMm'] }),
    sources: z
      .array(
        z.strictObject({
          key: z.string({ error: 'Each source needs a key' }).trim().min(1, { error: 'Each source needs a key' }).max(40),
          role: z.enum(['desired', 'interferer', 'other'], { error: 'Role is desired, interferer or other' }),
          frequencyHz: positive('Frequency').max(1e12, { error: 'Frequency must be at most 1 THz' }),
          powerDbm: z.number({ error: 'Power must be a number' }).finite().min(-200).max(80, { error: 'Power must be at most +80 dBm' }),
        }),
      )
      .min(1, { error: 'Give at least one source' })
      .max(8, { error: 'At most 8 sources' }),
    paths: z.array(
      z.strictObject({
        source: z.string({ error: 'Each path names its source' }),
        channel: z.number({ error: 'channel must be a number' }).int().min(0, { error: 'channel cannot be negative' }),
        segments: z.array(segmentInputSchema).max(32, { error: 'At most 32 segments per path' }),
      }),
    ),
    combiner: z.strictObject({
      delaysPs: z.array(z.number({ error: 'Chip delays must be numbers' }).finite().min(0, { error: 'Chip delays cannot be negative' }).max(1e6)),
      gains: z.array(z.number({ error: 'Gains must be numbers' }).finite().min(0, { error: 'Gains cannot be negative' }).max(1e3)).optional(),
    }),
    inputs: z.array(z.strictObject({ channel: z.number().int().min(0), maxInputDbm: z.number({ error: 'maxInputDbm must be a number' }).finite() })).optional(),
    nullSearch: z
      .strictObject({ interferer: z.string(), maxDelayPs: positive('Chip delay range').max(1e6), stepPs: positive('Chip delay step') })
      .refine((s) => s.maxDelayPs / s.stepPs <= 100_000, { error: 'The search would take more than 100 000 steps: use a larger step', path: ['stepPs'] })
      .optional(),
  })
  .superRefine((doc, ctx) => {
    const n = doc.array.elements;
    const keys = doc.sources.map((s) => s.key);
    keys.forEach((key, i) => {
      if (keys.indexOf(key) !== i) ctx.addIssue({ code: 'custom', path: ['sources', i, 'key'], message: `Source key ${key} is used twice` });
    });
    const seen = new Set<string>();
    doc.paths.forEach((p, i) => {
      if (!keys.includes(p.source)) ctx.addIssue({ code: 'custom', path: ['paths', i, 'source'], message: `Unknown source ${p.source}` });
      if (p.channel >= n) ctx.addIssue({ code: 'custom', path: ['paths', i, 'channel'], message: `Channel ${p.channel} is out of range: the array has ${n} inputs (0–${n - 1})` });
      const id = `${p.source}#${p.channel}`;
      if (seen.has(id)) ctx.addIssue({ code: 'custom', path: ['paths', i], message: `Two paths for ${p.source} to input ${p.channel}` });
      seen.add(id);
    });
    for (const key of keys) {
      for (let c = 0; c < n; c++) {
        if (!seen.has(`${key}#${c}`)) ctx.addIssue({ code: 'custom', path: ['paths'], message: `Missing the path of ${key} to input ${c}` });
      }
    }
    if (doc.combiner.delaysPs.length !== n) ctx.addIssue({ code: 'custom', path: ['combiner', 'delaysPs'], message: `Give one chip delay per input (${n})` });
    if (doc.combiner.gains && doc.combiner.gains.length !== n) ctx.addIssue({ code: 'custom', path: ['combiner', 'gains'], message: `Give one gain per input (${n})` });
    doc.inputs?.forEach((input, i) => {
      if (input.channel >= n) ctx.addIssue({ code: 'custom', path: ['inputs', i, 'channel'], message: `Channel ${input.channel} is out of range` });
    });
    if (doc.nullSearch && !keys.includes(doc.nullSearch.interferer)) {
      ctx.addIssue({ code: 'custom', path: ['nullSearch', 'interferer'], message: `Unknown source ${doc.nullSearch.interferer}` });
    }
  });
export type AnalysisInput = z.infer<typeof analysisInputSchema>;
