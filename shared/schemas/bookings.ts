import { z } from 'zod';

/** Longest span of one booking or maintenance block; range reads use it to bound their index scan. */
export const MAX_BOOKING_DAYS = 14;
/** Check-in opens this many minutes before the start. */
export const CHECK_IN_EARLY_MINUTES = 15;
/** A booking not checked in this many minutes after its start is marked no-show and released. */
export const NO_SHOW_AFTER_MINUTES = 30;
/** Longest range one calendar read may ask for. */
export const MAX_RANGE_DAYS = 62;

export const bookingKinds = ['booking', 'maintenance'] as const;
export type BookingKind = (typeof bookingKinds)[number];
export const bookingStatuses = ['confirmed', 'checked-in', 'completed', 'cancelled', 'no-show'] as const;
export type BookingStatus = (typeof bookingStatuses)[number];
export const bookingStatusLabels: Record<BookingStatus, string> = {
  confirmed: 'Confirmed',
  'checked-in': 'Checked in',
  completed: 'Completed',
  cancelled: 'Cancelled',
  'no-show': 'No-show',
};

/** An instant with an explicit offset or Z (`2026-12-03T13:00:00+01:00`); stored as UTC. */
export const instantSchema = (what: string) =>
  z.iso.datetime({ offset: true, error: `${what} must be a date and time with a time zone, e.g. 2026-12-03T13:00:00+01:00` });

const instrumentIdsSchema = z
  .array(z.number({ error: 'Instrument ids must be numbers' }).int().positive(), { error: 'Choose at least one instrument' })
  .min(1, { error: 'Choose at least one instrument' })
  .max(12, { error: 'Book at most 12 instruments at once' })
  .refine((ids) => new Set(ids).size === ids.length, { error: 'An instrument is listed twice' });

const purposeSchema = z.string({ error: 'Say what the booking is for' }).trim().min(1, { error: 'Say what the booking is for' }).max(200, { error: 'Purpose must be at most 200 characters' });
const projectCodeSchema = z.string().trim().max(40, { error: 'Project code must be at most 40 characters' });
const bookingNotesSchema = z.string().trim().max(2000, { error: 'Notes must be at most 2000 characters' });

function rangeOrder(value: { startsAt?: string; endsAt?: string }, ctx: z.RefinementCtx) {
  if (value.startsAt && value.endsAt && Date.parse(value.endsAt) <= Date.parse(value.startsAt)) {
    ctx.addIssue({ code: 'custom', path: ['endsAt'], message: 'The end must be after the start' });
  }
}

/** POST /api/bookings */
export const createBookingInputSchema = z
  .strictObject({
    instrumentIds: instrumentIdsSchema,
    startsAt: instantSchema('Start'),
    endsAt: instantSchema('End'),
    purpose: purposeSchema,
    projectCode: projectCodeSchema.optional(),
    notes: bookingNotesSchema.optional(),
    /** `maintenance` blocks are for managers; they block like bookings and skip the booking rules. */
    kind: z.enum(bookingKinds, { error: 'Kind is booking or maintenance' }).optional(),
    /** A manager may book an instrument whose calibration is overdue; the override is recorded. */
    overrideCalibration: z.boolean().optional(),
  })
  .superRefine(rangeOrder);
export type CreateBookingInput = z.infer<typeof createBookingInputSchema>;

/** PATCH /api/bookings/:id: move it (drag or resize) or change its texts; the server re-checks every rule. */
export const updateBookingInputSchema = z
  .strictObject({
    startsAt: instantSchema('Start').optional(),
    endsAt: instantSchema('End').optional(),
    purpose: purposeSchema.optional(),
    projectCode: projectCodeSchema.optional(),
    notes: bookingNotesSchema.optional(),
    overrideCalibration: z.boolean().optional(),
  })
  .superRefine(rangeOrder)
  .refine((v) => Object.keys(v).length > 0, { error: 'Give at least one field to change' });
export type UpdateBookingInput = z.infer<typeof updateBookingInputSchema>;

/** POST /api/bookings/:id/check-out */
export const checkOutInputSchema = z.strictObject({
  handoverNote: z
    .string({ error: 'Leave a handover note for the next user' })
    .trim()
    .min(1, { error: 'Leave a handover note for the next user: state of the bench, anything unusual' })
    .max(4000, { error: 'Handover note must be at most 4000 characters' }),
  /** What was left connected on the bench (cables, pads, the setup record). */
  leftConnected: z.string().trim().max(2000, { error: 'At most 2000 characters' }).optional(),
});
export type CheckOutInput = z.infer<typeof checkOutInputSchema>;

/** POST /api/bookings/:id/cancel */
export const cancelInputSchema = z.strictObject({
  reason: z.string({ error: 'Give a reason' }).trim().min(1, { error: 'Give a reason for cancelling' }).max(500, { error: 'At most 500 characters' }),
});

/** Comma-separated ids in a query string: `instrumentId=3,5`. */
const idListSchema = z
  .string()
  .regex(/^\d+(,\d+)*$/, { error: 'instrumentId is a comma-separated list of instrument ids' })
  .transform((s) => [...new Set(s.split(',').map(Number))])
  .refine((ids) => ids.length <= 100, { error: 'At most 100 instruments at once' });

/** GET /api/bookings?from=&to=&instrumentId= */
export const listBookingsQuerySchema = z
  .object({
    from: instantSchema('from'),
    to: instantSchema('to'),
    instrumentId: idListSchema.optional(),
  })
  .superRefine((v, ctx) => {
    const span = Date.parse(v.to) - Date.parse(v.from);
    if (span <= 0) ctx.addIssue({ code: 'custom', path: ['to'], message: '`to` must be after `from`' });
    else if (span > MAX_RANGE_DAYS * 86_400_000) ctx.addIssue({ code: 'custom', path: ['to'], message: `Ask for at most ${MAX_RANGE_DAYS} days at once` });
  });
export type ListBookingsQuery = z.infer<typeof listBookingsQuerySchema>;

export const bookingInstrumentSchema = z.object({ id: z.number(), tag: z.string(), name: z.string(), kind: z.string() });

export const bookingSchema = z.object({
  id: z.number(),
  kind: z.enum(bookingKinds),
  status: z.enum(bookingStatuses),
  startsAt: z.string(),
  endsAt: z.string(),
  instruments: z.array(bookingInstrumentSchema),
  /** Who booked it and why: null for visitors, who see only instrument and time. */
  owner: z.object({ id: z.number(), name: z.string() }).nullable(),
  purpose: z.string().nullable(),
  projectCode: z.string().nullable(),
  notes: z.string().nullable(),
  handoverNote: z.string().nullable(),
  leftConnected: z.string().nullable(),
  cancelReason: z.string().nullable(),
  calibrationOverride: z.boolean(),
  checkedInAt: z.string().nullable(),
  checkedOutAt: z.string().nullable(),
  cancelledAt: z.string().nullable(),
  /** Whether the caller may move, check in, check out or cancel it. */
  canChange: z.boolean(),
  createdAt: z.string(),
});
export type Booking = z.infer<typeof bookingSchema>;

export const bookingEventSchema = z.object({
  id: z.number(),
  at: z.string(),
  actor: z.object({ id: z.number(), name: z.string() }).nullable(),
  action: z.string(),
  before: z.unknown().nullable(),
  after: z.unknown().nullable(),
});
export type BookingEvent = z.infer<typeof bookingEventSchema>;

export const bookingListSchema = z.object({ bookings: z.array(bookingSchema) });
export const bookingResponseSchema = z.object({ booking: bookingSchema });
export const bookingDetailSchema = z.object({ booking: bookingSchema, events: z.array(bookingEventSchema) });
export const myBookingsSchema = z.object({ upcoming: z.array(bookingSchema), past: z.array(bookingSchema) });

/** One slot that a request clashed with, in the 409's details. */
export const clashSchema = z.object({
  instrumentId: z.number(),
  tag: z.string(),
  startsAt: z.string(),
  endsAt: z.string(),
  kind: z.enum(bookingKinds),
  /** Who holds it, where the caller's role may see it. */
  owner: z.string().nullable(),
});
export type Clash = z.infer<typeof clashSchema>;

/** One broken booking rule, in the 422's details. */
export const ruleIssueSchema = z.object({
  rule: z.enum(['instrument-unavailable', 'calibration-overdue', 'qualification-missing', 'too-long', 'too-close', 'beyond-window', 'in-the-past', 'not-allowed']),
  instrumentId: z.number().nullable(),
  message: z.string(),
});
export type RuleIssue = z.infer<typeof ruleIssueSchema>;

// Waitlist
export const waitlistStatuses = ['waiting', 'offered', 'withdrawn', 'fulfilled'] as const;
export const createWaitlistInputSchema = z
  .strictObject({
    instrumentId: z.number({ error: 'Choose an instrument' }).int().positive(),
    startsAt: instantSchema('Start'),
    endsAt: instantSchema('End'),
    note: z.string().trim().max(500, { error: 'At most 500 characters' }).optional(),
  })
  .superRefine(rangeOrder);
export type CreateWaitlistInput = z.infer<typeof createWaitlistInputSchema>;

export const waitlistEntrySchema = z.object({
  id: z.number(),
  instrument: bookingInstrumentSchema,
  user: z.object({ id: z.number(), name: z.string() }),
  startsAt: z.string(),
  endsAt: z.string(),
  note: z.string(),
  status: z.enum(waitlistStatuses),
  /** When the slot freed and this person was offered it. */
  offeredAt: z.string().nullable(),
  /**
   * The freed time offered (the part of startsAt–endsAt that became free, never before the offer), which a
   * claim books; kept once claimed, null while waiting.
   */
  offeredStartsAt: z.string().nullable(),
  offeredEndsAt: z.string().nullable(),
  createdAt: z.string(),
});
export type WaitlistEntry = z.infer<typeof waitlistEntrySchema>;
export const waitlistListSchema = z.object({ entries: z.array(waitlistEntrySchema) });
