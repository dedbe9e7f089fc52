import { z } from 'zod';
import { frequencyHzSchema, frequencyRangeIssue, isoDateSchema, notesSchema, num, tagSchema } from './common.js';

export const instrumentKinds = [
  'probe-station',
  'signal-generator',
  'spectrum-analyzer',
  'oscilloscope',
  'vna',
  'power-supply',
  'other',
] as const;
export type InstrumentKind = (typeof instrumentKinds)[number];

export const instrumentKindLabels: Record<InstrumentKind, string> = {
  'probe-station': 'Probe station',
  'signal-generator': 'Signal generator',
  'spectrum-analyzer': 'Spectrum analyzer',
  oscilloscope: 'Oscilloscope',
  vna: 'Vector network analyzer',
  'power-supply': 'Power supply',
  other: 'Other',
};

export const instrumentStatuses = ['in-service', 'maintenance', 'retired'] as const;
export type InstrumentStatus = (typeof instrumentStatuses)[number];
export const instrumentStatusLabels: Record<InstrumentStatus, string> = {
  'in-service': 'In service',
  maintenance: 'Maintenance',
  retired: 'Retired',
};

const instrumentFields = z.strictObject({
  tag: tagSchema,
  name: z.string({ error: 'Enter a name' }).trim().min(1, { error: 'Enter a name' }).max(120, { error: 'Name must be at most 120 characters' }),
  kind: z.enum(instrumentKinds, { error: 'Choose a kind of instrument' }),
  location: z.string().trim().max(120, { error: 'Location must be at most 120 characters' }).optional(),
  status: z.enum(instrumentStatuses, { error: 'Choose in service, maintenance or retired' }).optional(),
  calibrationDueOn: isoDateSchema.nullable().optional(),
  minFrequencyHz: frequencyHzSchema('Lowest frequency').nullable().optional(),
  maxFrequencyHz: frequencyHzSchema('Highest frequency').nullable().optional(),
  /** Maximum safe RF input level, for instruments with an RF input. */
  maxSafeInputDbm: num('Maximum safe input').min(-100, { error: 'Maximum safe input must be at least −100 dBm' }).max(80, { error: 'Maximum safe input must be at most +80 dBm' }).nullable().optional(),
  qualificationRequired: z.boolean({ error: 'Say whether a qualification is needed' }).optional(),
  /** Longest single booking, hours; null for no limit. */
  maxBookingHours: num('Longest booking').positive({ error: 'Longest booking must be above 0 hours' }).max(24 * 14, { error: 'Longest booking must be at most 336 hours' }).nullable().optional(),
  /** Minimum gap between two bookings of this instrument, minutes. */
  minGapMinutes: num('Minimum gap').int({ error: 'Minimum gap must be whole minutes' }).min(0, { error: 'Minimum gap cannot be negative' }).max(24 * 60, { error: 'Minimum gap must be at most 1440 minutes' }).optional(),
  /** How many days ahead booking opens. */
  advanceDays: num('Booking window').int({ error: 'Booking window must be whole days' }).min(1, { error: 'Booking window must be at least 1 day' }).max(730, { error: 'Booking window must be at most 730 days' }).optional(),
  notes: notesSchema.optional(),
});

const rangeCheck = (value: { minFrequencyHz?: number | null; maxFrequencyHz?: number | null }, ctx: z.RefinementCtx) => {
  if (frequencyRangeIssue(value.minFrequencyHz, value.maxFrequencyHz)) {
    ctx.addIssue({ code: 'custom', path: ['maxFrequencyHz'], message: 'Highest frequency must not be below the lowest' });
  }
};

/** Values of the optional fields when a new instrument leaves them out. */
export const instrumentDefaults = {
  location: '',
  status: 'in-service',
  calibrationDueOn: null,
  minFrequencyHz: null,
  maxFrequencyHz: null,
  maxSafeInputDbm: null,
  qualificationRequired: false,
  maxBookingHours: null,
  minGapMinutes: 0,
  advanceDays: 60,
  notes: '',
} as const;

/** A whole instrument (create, or a stored record merged with a change); output has every field. */
export const instrumentInputSchema = instrumentFields.superRefine(rangeCheck).transform((v) => ({ ...instrumentDefaults, ...v }));
export type InstrumentInput = z.input<typeof instrumentInputSchema>;
export type InstrumentValues = z.output<typeof instrumentInputSchema>;

/**
 * PATCH: any subset of the fields, without defaults (a missing field stays as stored); the server merges it
 * with the stored record and validates the whole with instrumentInputSchema.
 */
export const instrumentPatchSchema = instrumentFields.partial().refine((v) => Object.keys(v).length > 0, { error: 'Give at least one field to change' });

export const calibrationSchema = z.object({
  state: z.enum(['none', 'ok', 'due-soon', 'overdue']),
  daysLeft: z.number().nullable(),
});

export const instrumentSchema = instrumentFields.required().extend({
  id: z.number(),
  calibration: calibrationSchema,
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Instrument = z.infer<typeof instrumentSchema>;

export const instrumentListQuerySchema = z.object({
  kind: z.enum(instrumentKinds, { error: 'Unknown instrument kind' }).optional(),
  status: z.enum(instrumentStatuses, { error: 'Unknown instrument status' }).optional(),
  q: z.string().trim().max(100).optional(),
});

export const qualificationSchema = z.object({
  userId: z.number(),
  name: z.string(),
  email: z.string(),
  grantedAt: z.string(),
  grantedBy: z.string().nullable(),
});
export type Qualification = z.infer<typeof qualificationSchema>;

export const grantQualificationInputSchema = z.strictObject({
  userId: z.number({ error: 'Choose a person' }).int().positive(),
});

export const qualificationParamsSchema = z.object({
  id: z.coerce.number({ error: 'id must be a number' }).int().positive().max(2147483647),
  userId: z.coerce.number({ error: 'userId must be a number' }).int().positive().max(2147483647),
});
