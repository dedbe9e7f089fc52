import { z } from 'zod';

/** A feed covers this many days back from the moment a calendar app fetches it… */
export const FEED_PAST_DAYS = 30;
/** …and this many days ahead. */
export const FEED_AHEAD_DAYS = 180;

/** `person`: the token owner's own bookings; `instrument`: every booking and maintenance block of one instrument. */
export const feedScopes = ['person', 'instrument'] as const;
export type FeedScope = (typeof feedScopes)[number];

/** An instrument id; in a path it arrives as text, so `coerce` is only for params, never for JSON bodies. */
const instrumentIdSchema = (coerce: boolean) =>
  (coerce ? z.coerce.number({ error: 'Choose an instrument' }) : z.number({ error: 'Choose an instrument' }))
    .int({ error: 'instrumentId must be a whole number' })
    .positive({ error: 'instrumentId must be positive' })
    .max(2147483647, { error: 'instrumentId is too large' });

/** POST /api/feeds: make the feed's secret link, or replace it if it exists. */
export const createFeedInputSchema = z.discriminatedUnion(
  'scope',
  [z.strictObject({ scope: z.literal('person') }), z.strictObject({ scope: z.literal('instrument'), instrumentId: instrumentIdSchema(false) })],
  { error: 'scope is person or instrument' },
);
export type CreateFeedInput = z.infer<typeof createFeedInputSchema>;

/** DELETE /api/feeds/:scope; an instrument's feed has its own route with the id. */
export const personFeedParamsSchema = z.object({
  scope: z.literal('person', { error: 'Use /api/feeds/person, or /api/feeds/instrument/:instrumentId for an instrument feed' }),
});

/** DELETE /api/feeds/instrument/:instrumentId */
export const instrumentFeedParamsSchema = z.object({ instrumentId: instrumentIdSchema(true) });

/** GET /api/feeds/:token.ics; any string, since a malformed token is just an unknown one (404). */
export const feedTokenParamsSchema = z.object({ token: z.string() });

export const calendarFeedSchema = z.object({
  scope: z.enum(feedScopes),
  instrumentId: z.number().nullable(),
  instrumentTag: z.string().nullable(),
  createdAt: z.string(),
  /** The subscription URL: only in the answer that made the token, which is never stored and never shown again. */
  url: z.string().nullable(),
});
export type CalendarFeed = z.infer<typeof calendarFeedSchema>;

export const feedListSchema = z.object({ feeds: z.array(calendarFeedSchema) });
export const feedResponseSchema = z.object({ feed: calendarFeedSchema });
