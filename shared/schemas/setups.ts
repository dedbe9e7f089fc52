import { z } from 'zod';
import { analysisInputSchema } from './analysis.js';

/**
 * A setup record: how the bench was wired for a booking. `analysis` is exactly the POST /api/analysis document
 * (array, sources, paths of segments, combiner, inputs, null search), so the same engine previews and stores it;
 * the rest records what the analysis does not need but a rebuild does.
 */
export const setupDocumentSchema = z.strictObject({
  title: z.string({ error: 'Give the setup a title' }).trim().min(1, { error: 'Give the setup a title' }).max(160, { error: 'At most 160 characters' }),
  analysis: analysisInputSchema,
  /** Which signal generator (instrument id) plays each source, and how it is modulated. */
  generators: z
    .array(z.strictObject({ source: z.string(), instrumentId: z.number().int().positive().nullable(), modulation: z.string().trim().max(200).default('') }))
    .default([]),
  /** Which instrument measures the combiner output, and how. */
  outputs: z.array(z.strictObject({ instrumentId: z.number().int().positive(), note: z.string().trim().max(200).default('') })).default([]),
  /** Chip delay settings as codes times a step, where the chip is set that way (t_n = code_n · stepPs). */
  delayCodes: z.strictObject({ codes: z.array(z.number().int().min(0)), stepPs: z.number().positive() }).nullable().default(null),
  dut: z
    .strictObject({
      chip: z.string().trim().max(120).default(''),
      board: z.string().trim().max(120).default(''),
      die: z.string().trim().max(120).default(''),
      supplies: z.string().trim().max(400).default(''),
      notes: z.string().trim().max(2000).default(''),
    })
    .default({ chip: '', board: '', die: '', supplies: '', notes: '' }),
  /** Free key/value settings per instrument (centre frequency, span, RBW, …). */
  settings: z
    .array(z.strictObject({ instrumentId: z.number().int().positive(), key: z.string().trim().min(1, { error: 'Name the setting' }).max(60), value: z.string().trim().max(200) }))
    .max(200)
    .default([]),
  notes: z.string().trim().max(4000).default(''),
});
export type SetupDocument = z.output<typeof setupDocumentSchema>;
export type SetupDocumentInput = z.input<typeof setupDocumentSchema>;

/** POST /api/setups */
export const createSetupInputSchema = z.strictObject({
  bookingId: z.number({ error: 'Choose the booking this setup belongs to' }).int().positive(),
  document: setupDocumentSchema,
  note: z.string().trim().max(500).default(''),
});

/** PUT /api/setups/:id: save a new revision (nothing is ever overwritten). */
export const saveRevisionInputSchema = z.strictObject({
  document: setupDocumentSchema,
  /** What changed, in the saver's words. */
  note: z.string().trim().max(500).default(''),
});

/** POST /api/setups/:id/reload: start a new setup for another booking from a revision. */
export const reloadSetupInputSchema = z.strictObject({
  bookingId: z.number({ error: 'Choose the booking to reload into' }).int().positive(),
  revision: z.number().int().positive().optional(),
});

export const revisionSummarySchema = z.object({
  id: z.number(),
  number: z.number(),
  savedAt: z.string(),
  savedBy: z.object({ id: z.number(), name: z.string() }),
  note: z.string(),
});
export type RevisionSummary = z.infer<typeof revisionSummarySchema>;

/** A part that another setup holds in an overlapping booking. */
export const partHeldSchema = z.object({ partId: z.number(), tag: z.string(), setupId: z.number(), setupTitle: z.string(), bookingId: z.number(), owner: z.string().nullable() });

export const setupSchema = z.object({
  id: z.number(),
  bookingId: z.number(),
  booking: z.object({ startsAt: z.string(), endsAt: z.string(), instruments: z.array(z.object({ id: z.number(), tag: z.string() })) }),
  owner: z.object({ id: z.number(), name: z.string() }),
  title: z.string(),
  reloadedFrom: z.object({ setupId: z.number(), revision: z.number(), title: z.string() }).nullable(),
  revision: z.object({
    id: z.number(),
    number: z.number(),
    savedAt: z.string(),
    savedBy: z.object({ id: z.number(), name: z.string() }),
    note: z.string(),
    document: z.unknown(),
    /** The server's analysis of this revision, stored with it (authoritative). */
    analysis: z.unknown(),
  }),
  revisions: z.array(revisionSummarySchema),
  partsHeld: z.array(partHeldSchema),
  canEdit: z.boolean(),
  createdAt: z.string(),
});
export type Setup = z.infer<typeof setupSchema>;

export const setupListItemSchema = z.object({
  id: z.number(),
  bookingId: z.number(),
  title: z.string(),
  owner: z.object({ id: z.number(), name: z.string() }),
  bookingStartsAt: z.string(),
  revisions: z.number(),
  updatedAt: z.string(),
});
export const setupListSchema = z.object({ setups: z.array(setupListItemSchema) });
export const setupListQuerySchema = z.object({
  bookingId: z.coerce.number().int().positive().optional(),
  mine: z.enum(['true', 'false']).optional(),
});

export const compareQuerySchema = z.object({
  from: z.coerce.number({ error: 'from is a revision id' }).int().positive(),
  to: z.coerce.number({ error: 'to is a revision id' }).int().positive(),
});
