import { z } from 'zod';
import { dielectrics } from '../domain/cable.js';
import { connectors, genders, type Gender } from '../domain/connectors.js';
import { frequencyHzSchema, frequencyRangeIssue, isoDateSchema, notesSchema, num, tagSchema } from './common.js';

export const partKinds = ['cable', 'attenuator', 'adapter', 'splitter', 'dc-block', 'other'] as const;
export type PartKind = (typeof partKinds)[number];
export const partKindLabels: Record<PartKind, string> = {
  cable: 'Coaxial cable',
  attenuator: 'Attenuator',
  adapter: 'Adapter',
  splitter: 'Power splitter / combiner',
  'dc-block': 'DC block',
  other: 'Other',
};

// Connector types and genders live in the domain (the mating rule needs them); re-exported for the API's users.
export { connectorLabels, connectors, genderLabels, genders, genderShortLabels, type Connector, type Gender } from '../domain/connectors.js';

export const partStatuses = ['ok', 'damaged', 'lost'] as const;
export type PartStatus = (typeof partStatuses)[number];
export const partStatusLabels: Record<PartStatus, string> = { ok: 'OK', damaged: 'Damaged', lost: 'Lost' };

const connectorSchema = z.enum(connectors, { error: 'Choose SMA, 2.92 mm, 3.5 mm, N, BNC or other' });
const genderSchema = z.enum(genders, { error: 'Choose male (plug) or female (jack)' });

/** Every field a part can have; which apply depends on `kind` (checked below). */
const partFields = z.strictObject({
  tag: tagSchema,
  kind: z.enum(partKinds, { error: 'Choose cable, attenuator, adapter, splitter, dc-block or other' }),
  description: z.string().trim().max(200, { error: 'Description must be at most 200 characters' }).optional(),
  connectorA: connectorSchema,
  genderA: genderSchema,
  connectorB: connectorSchema,
  genderB: genderSchema,
  status: z.enum(partStatuses, { error: 'Choose ok, damaged or lost' }).optional(),
  notes: notesSchema.optional(),
  // cable
  lengthMm: num('Length').positive({ error: 'Length must be above 0 mm' }).max(1e6, { error: 'Length must be at most 1000 m' }).nullable().optional(),
  dielectric: z.enum(dielectrics, { error: 'Choose PTFE, solid PE, foamed PE, air or other' }).nullable().optional(),
  /** Datasheet velocity factor; wins over the dielectric's nominal value. */
  velocityFactor: num('Velocity factor').gt(0, { error: 'Velocity factor must be above 0' }).max(1, { error: 'Velocity factor must be at most 1' }).nullable().optional(),
  lossDbPerM: num('Loss per metre').min(0, { error: 'Loss per metre cannot be negative' }).max(100, { error: 'Loss per metre must be at most 100 dB/m' }).nullable().optional(),
  lossRefHz: frequencyHzSchema('Loss reference frequency').nullable().optional(),
  measuredDelayPs: num('Measured delay').positive({ error: 'Measured delay must be above 0 ps' }).max(1e9, { error: 'Measured delay is too large' }).nullable().optional(),
  measuredOn: isoDateSchema.nullable().optional(),
  measuredHow: z.string().trim().max(200, { error: 'At most 200 characters' }).nullable().optional(),
  // attenuator (nominal attenuation), adapter, dc-block, splitter (per branch), other
  lossDb: num('Loss').min(0, { error: 'Loss cannot be negative' }).max(200, { error: 'Loss must be at most 200 dB' }).nullable().optional(),
  // adapter, dc-block, other: an entered delay (cables compute theirs)
  delayPs: num('Delay').min(0, { error: 'Delay cannot be negative' }).max(1e9, { error: 'Delay is too large' }).nullable().optional(),
  // attenuator
  maxInputDbm: num('Maximum input power').min(-50, { error: 'Maximum input power must be at least −50 dBm' }).max(80, { error: 'Maximum input power must be at most +80 dBm' }).nullable().optional(),
  minFrequencyHz: frequencyHzSchema('Lowest frequency').nullable().optional(),
  maxFrequencyHz: frequencyHzSchema('Highest frequency').nullable().optional(),
});

type PartShape = z.output<typeof partFields>;

function kindRules(value: Partial<PartShape>, ctx: z.RefinementCtx) {
  const issue = (path: keyof PartShape, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
  if (value.kind === 'cable') {
    if (value.lengthMm == null) issue('lengthMm', 'Enter the cable length in mm');
    if (value.dielectric == null) issue('dielectric', 'Choose the dielectric');
    if (value.dielectric === 'other' && value.velocityFactor == null) issue('velocityFactor', 'Enter the velocity factor from the datasheet for this dielectric');
    if ((value.lossDbPerM == null) !== (value.lossRefHz == null)) {
      issue(value.lossDbPerM == null ? 'lossDbPerM' : 'lossRefHz', 'Give the loss per metre together with its reference frequency');
    }
    if (value.delayPs != null) issue('delayPs', 'A cable’s delay is computed; record a measured delay instead');
  }
  if (value.kind === 'attenuator' && value.lossDb == null) issue('lossDb', 'Enter the nominal attenuation in dB');
  if (frequencyRangeIssue(value.minFrequencyHz, value.maxFrequencyHz)) issue('maxFrequencyHz', 'Highest frequency must not be below the lowest');
}

/**
 * The usual genders of each kind's ends (common practice): a cable has plugs at both ends, a pad or DC block a
 * plug and a jack, a barrel adapter or a splitter jacks. The form proposes them for a new part, and migration
 * 20261201000700 gave them to the parts stored before genders were recorded.
 */
export const typicalGenders: Record<PartKind, { genderA: Gender; genderB: Gender }> = {
  cable: { genderA: 'male', genderB: 'male' },
  attenuator: { genderA: 'male', genderB: 'female' },
  adapter: { genderA: 'female', genderB: 'female' },
  splitter: { genderA: 'female', genderB: 'female' },
  'dc-block': { genderA: 'male', genderB: 'female' },
  other: { genderA: 'male', genderB: 'female' },
};

/** Values of the optional fields when a new part leaves them out. */
export const partDefaults = {
  description: '',
  status: 'ok',
  notes: '',
  lengthMm: null,
  dielectric: null,
  velocityFactor: null,
  lossDbPerM: null,
  lossRefHz: null,
  measuredDelayPs: null,
  measuredOn: null,
  measuredHow: null,
  lossDb: null,
  delayPs: null,
  maxInputDbm: null,
  minFrequencyHz: null,
  maxFrequencyHz: null,
} as const;

/** A whole part (create, CSV row, or a stored record merged with a change); output has every field. */
export const partInputSchema = partFields.superRefine(kindRules).transform((v) => ({ ...partDefaults, ...v }));
export type PartInput = z.input<typeof partInputSchema>;
export type PartValues = z.output<typeof partInputSchema>;

/** PATCH: any subset, without defaults; the server merges it with the stored part and validates the whole. */
export const partPatchSchema = partFields.partial().refine((v) => Object.keys(v).length > 0, { error: 'Give at least one field to change' });

export const partSchema = partFields.required().extend({
  id: z.number(),
  /** For cables: the measured delay where recorded, else L/(VF·c); for other kinds: the entered delay. */
  delayPs: z.number().nullable(),
  computedDelayPs: z.number().nullable(),
  delaySource: z.enum(['measured', 'computed', 'entered']).nullable(),
  /** For cables: the velocity factor in use (datasheet, else from the dielectric). */
  velocityFactor: z.number().nullable(),
  velocityFactorSource: z.enum(['datasheet', 'dielectric']).nullable(),
  delayPerMetrePs: z.number().nullable(),
  freeSpaceLengthMm: z.number().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Part = z.infer<typeof partSchema>;

export const partListQuerySchema = z.object({
  kind: z.enum(partKinds, { error: 'Unknown part kind' }).optional(),
  status: z.enum(partStatuses, { error: 'Unknown part status' }).optional(),
  q: z.string().trim().max(100).optional(),
});
