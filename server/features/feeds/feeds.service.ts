import { createHash, randomBytes } from 'node:crypto';
import ical, { escape } from 'ical-generator';
import { QueryTypes } from 'sequelize';
import { hasRole, type Role } from '../../../shared/domain/roles.js';
import { MAX_BOOKING_DAYS, type BookingKind } from '../../../shared/schemas/bookings.js';
import { FEED_AHEAD_DAYS, FEED_PAST_DAYS, type CalendarFeed, type CreateFeedInput, type FeedScope } from '../../../shared/schemas/feeds.js';
import { notFound } from '../../lib/errors.js';
import { FeedModel } from './feed.model.js';

/** What the feeds need to know about the lab: where it is served and what it is called. */
export interface FeedSite {
  publicUrl: string;
  labName: string;
}

const DAY_MS = 86_400_000;

/** 32 random bytes in base64url: 43 characters, nothing to escape in a URL. */
const tokenPattern = /^[A-Za-z0-9_-]{43}$/;

/** The stored form of a token. A fast hash is enough: the token has 256 random bits, so there is nothing to guess. */
const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

const feedNotFound = () => notFound('Calendar feed');

const db = () => FeedModel.sequelize!;

interface FeedRow {
  scope: FeedScope;
  instrument_id: number | null;
  instrument_tag: string | null;
  created_at: Date;
}

function toFeed(row: FeedRow, url: string | null): CalendarFeed {
  return {
    scope: row.scope,
    instrumentId: row.instrument_id,
    instrumentTag: row.instrument_tag,
    createdAt: new Date(row.created_at).toISOString(),
    url,
  };
}

/** The caller's feeds, person feed first. The URLs are gone: only their hashes were kept. */
export async function listFeeds(userId: number): Promise<CalendarFeed[]> {
  const rows = await db().query<FeedRow>(
    `SELECT f.scope, f.instrument_id, i.tag AS instrument_tag, f.created_at
       FROM calendar_feeds f
       LEFT JOIN instruments i ON i.id = f.instrument_id
      WHERE f.user_id = :userId
      ORDER BY f.scope DESC, i.tag`,
    { replacements: { userId }, type: QueryTypes.SELECT },
  );
  return rows.map((row) => toFeed(row, null));
}

/**
 * Make a feed's secret URL. If the person already has that feed, the new token replaces the old one in the
 * same row, so the old URL stops working with this statement.
 */
export async function createFeed(userId: number, input: CreateFeedInput, site: FeedSite): Promise<CalendarFeed> {
  const instrumentId = input.scope === 'instrument' ? input.instrumentId : null;
  let instrumentTag: string | null = null;
  if (instrumentId !== null) {
    const [instrument] = await db().query<{ tag: string }>('SELECT tag FROM instruments WHERE id = :instrumentId', {
      replacements: { instrumentId },
      type: QueryTypes.SELECT,
    });
    if (!instrument) throw notFound('Instrument');
    instrumentTag = instrument.tag;
  }
  const token = randomBytes(32).toString('base64url');
  // One upsert on the unique index, so two concurrent regenerations cannot leave two rows or fail on each other.
  const [row] = await db().query<{ created_at: Date }>(
    `INSERT INTO calendar_feeds (user_id, scope, instrument_id, token_hash)
     VALUES (:userId, :scope, :instrumentId, :tokenHash)
     ON CONFLICT (user_id, scope, (coalesce(instrument_id, 0)))
     DO UPDATE SET token_hash = EXCLUDED.token_hash, created_at = now()
     RETURNING created_at`,
    { replacements: { userId, scope: input.scope, instrumentId, tokenHash: hashToken(token) }, type: QueryTypes.SELECT },
  );
  return toFeed(
    { scope: input.scope, instrument_id: instrumentId, instrument_tag: instrumentTag, created_at: row!.created_at },
    `${site.publicUrl}/api/feeds/${token}.ics`,
  );
}

export async function revokeFeed(userId: number, scope: FeedScope, instrumentId: number | null): Promise<void> {
  const removed = await FeedModel.destroy({ where: { userId, scope, instrumentId } });
  if (!removed) throw feedNotFound();
}

interface FeedOwnerRow {
  scope: FeedScope;
  user_id: number;
  instrument_id: number | null;
  instrument_tag: string | null;
  role: Role;
}

interface FeedBookingRow {
  id: number;
  kind: BookingKind;
  starts_at: Date;
  ends_at: Date;
  purpose: string;
  project_code: string;
  owner_name: string;
  created_at: Date;
  updated_at: Date;
  tags: string[];
  locations: string[];
}

/**
 * The bookings a feed shows, in one query. Person feeds read bookings (owner_id, starts_at); instrument feeds
 * pick booking ids through booking_instruments (instrument_id, starts_at). Both bound starts_at from below by
 * the longest possible booking, so the range stays an index scan, and then keep what overlaps the window.
 */
async function feedBookings(feed: FeedOwnerRow, now: Date): Promise<FeedBookingRow[]> {
  const from = new Date(now.getTime() - FEED_PAST_DAYS * DAY_MS);
  const to = new Date(now.getTime() + FEED_AHEAD_DAYS * DAY_MS);
  const earliestStart = new Date(from.getTime() - MAX_BOOKING_DAYS * DAY_MS);
  const picked =
    feed.scope === 'person'
      ? 'b.owner_id = :userId AND b.starts_at > :earliestStart AND b.starts_at < :to AND b.ends_at > :from'
      : `b.id IN (SELECT p.booking_id FROM booking_instruments p
                   WHERE p.instrument_id = :instrumentId AND p.starts_at > :earliestStart AND p.starts_at < :to AND p.ends_at > :from)`;
  // A person still wants to see a slot they missed; an instrument's calendar shows only time that was really taken.
  const hidden = feed.scope === 'person' ? ['cancelled'] : ['cancelled', 'no-show'];
  return db().query<FeedBookingRow>(
    `SELECT b.id, b.kind, b.starts_at, b.ends_at, b.purpose, b.project_code, b.created_at, b.updated_at, u.name AS owner_name,
            array_agg(i.tag ORDER BY i.tag) AS tags, array_agg(DISTINCT i.location) AS locations
       FROM bookings b
       JOIN users u ON u.id = b.owner_id
       JOIN booking_instruments bi ON bi.booking_id = b.id
       JOIN instruments i ON i.id = bi.instrument_id
      WHERE ${picked} AND b.status NOT IN (:hidden)
      GROUP BY b.id, u.name
      ORDER BY b.starts_at, b.id`,
    {
      replacements: { userId: feed.user_id, instrumentId: feed.instrument_id, from, to, earliestStart, hidden },
      type: QueryTypes.SELECT,
    },
  );
}

/**
 * The iCalendar text of the feed behind a token (RFC 5545), or 404. Times are UTC ('Z', §3.3.5 form #2),
 * so no VTIMEZONE is needed. What it reveals follows the token owner's current role, as the bookings API
 * does: visitors see instruments and times, never who booked or why.
 */
export async function renderFeed(token: string, site: FeedSite, now = new Date()): Promise<string> {
  if (!tokenPattern.test(token)) throw feedNotFound();
  // A deactivated owner's feeds stop answering, as their sessions do.
  const [feed] = await db().query<FeedOwnerRow>(
    `SELECT f.scope, f.user_id, f.instrument_id, i.tag AS instrument_tag, u.role
       FROM calendar_feeds f
       JOIN users u ON u.id = f.user_id AND u.active
       LEFT JOIN instruments i ON i.id = f.instrument_id
      WHERE f.token_hash = :tokenHash`,
    { replacements: { tokenHash: hashToken(token) }, type: QueryTypes.SELECT },
  );
  if (!feed) throw feedNotFound();

  // The same rule as the bookings API's seesDetails.
  const reveal = hasRole(feed.role, 'researcher');
  const title = feed.scope === 'person' ? `My bench bookings · ${site.labName}` : `${feed.instrument_tag} · ${site.labName}`;
  const calendar = ical({
    // ical-generator 10 writes NAME and X-WR-CALNAME unescaped; a lab name with a comma must stay TEXT (§3.3.11).
    name: escape(title, false),
    prodId: { company: 'Skewbench', product: 'Bench bookings', language: 'EN' },
    // REFRESH-INTERVAL: no point polling faster than the response may be cached (max-age=300), nor much slower.
    ttl: 15 * 60,
  });
  // UIDs must be globally unique (§3.8.4.7): the lab's host tells two labs' booking 12 apart.
  const uidDomain = new URL(site.publicUrl).host;

  for (const b of await feedBookings(feed, now)) {
    const tags = b.tags.join(' + ');
    const link = `${site.publicUrl}/bookings/${b.id}`;
    let summary: string;
    if (b.kind === 'maintenance') summary = `Maintenance: ${tags}`;
    else if (reveal && b.purpose) summary = `${tags} · ${b.purpose}`;
    else summary = `${tags} booked`;
    const details = reveal
      ? [b.purpose, b.project_code && `Project ${b.project_code}`, feed.scope === 'instrument' && `Booked by ${b.owner_name}`]
      : [];
    calendar.createEvent({
      id: `booking-${b.id}@${uidDomain}`,
      // Without METHOD, DTSTAMP is when the event was last revised in the store (§3.8.7.2), so it is stable per fetch.
      stamp: new Date(b.updated_at),
      created: new Date(b.created_at),
      lastModified: new Date(b.updated_at),
      start: new Date(b.starts_at),
      end: new Date(b.ends_at),
      summary,
      location: b.locations.filter(Boolean).join('; ') || null,
      description: [...details.filter(Boolean), `Details: ${link}`].join('\n'),
      url: link,
    });
  }
  // §3.4: an iCalendar object ends with "END:VCALENDAR" CRLF; ical-generator 10 leaves the last CRLF off.
  return `${calendar.toString()}\r\n`;
}
