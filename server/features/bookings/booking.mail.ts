// The booking messages, queued in the transaction of the change that causes them: each function reads what
// its message shows through that transaction (so it sees the change itself) and hands it to enqueueForUser,
// which skips people who switched the topic off. Rolled back, the change leaves no message behind.
import { QueryTypes, type Transaction } from 'sequelize';
import { NO_SHOW_AFTER_MINUTES } from '../../../shared/schemas/bookings.js';
import { enqueueForUser } from '../mail/outbox.service.js';
import type { MailLab } from '../mail/templates/compose.js';
import {
  bookingCancelledMail,
  bookingChangedMail,
  bookingConfirmedMail,
  handoverMail,
  noShowMail,
  waitlistOfferMail,
  type BookingMailLab,
  type HandoverNext,
  type MailBooking,
  type MailInstrument,
} from '../mail/templates/bookings.js';
import { BookingModel } from './booking.model.js';

export type { BookingMailLab };

const db = () => BookingModel.sequelize!;

/** What the routes know about the lab, plus the clock's time zone: everything a booking message needs. */
export const mailLab = (lab: MailLab, timeZone: string): BookingMailLab => ({ name: lab.name, publicUrl: lab.publicUrl, timeZone });

const instrumentsJson = (bookingId: string) => `(SELECT json_agg(json_build_object('id', i.id, 'tag', i.tag, 'name', i.name, 'location', i.location) ORDER BY i.tag)
     FROM booking_instruments bi JOIN instruments i ON i.id = bi.instrument_id WHERE bi.booking_id = ${bookingId})`;

interface LoadedBooking extends MailBooking {
  ownerId: number;
}

async function loadBooking(id: number, transaction: Transaction): Promise<LoadedBooking> {
  const [row] = await db().query<LoadedBooking>(
    `SELECT b.id, b.kind, b.owner_id AS "ownerId", u.name AS "ownerName", b.starts_at AS "startsAt", b.ends_at AS "endsAt",
            b.purpose, b.project_code AS "projectCode", b.notes, b.created_at AS "createdAt", b.updated_at AS "updatedAt",
            ${instrumentsJson('b.id')} AS instruments
       FROM bookings b JOIN users u ON u.id = b.owner_id WHERE b.id = :id`,
    { replacements: { id }, type: QueryTypes.SELECT, transaction },
  );
  if (!row) throw new Error(`booking ${id} vanished inside its own transaction`);
  return { ...row, startsAt: new Date(row.startsAt), endsAt: new Date(row.endsAt), createdAt: new Date(row.createdAt), updatedAt: new Date(row.updatedAt), instruments: row.instruments ?? [] };
}

/** A new booking: the owner gets a confirmation with the booking as an .ics attachment. */
export async function queueBookingConfirmed(transaction: Transaction, lab: BookingMailLab, bookingId: number, now: Date): Promise<void> {
  const b = await loadBooking(bookingId, transaction);
  // Maintenance blocks get no confirmation: a lab manager adds them on the calendar for the lab, not as a slot
  // of their own to keep in a personal calendar, and they can see the block where they just placed it.
  if (b.kind === 'maintenance') return;
  await enqueueForUser(transaction, 'booking-confirmed', b.ownerId, (r) => bookingConfirmedMail(lab, r.name, b, now));
}

export interface BookingTexts {
  startsAt: Date;
  endsAt: Date;
  purpose: string;
  projectCode: string;
  notes: string;
}

const textLabels = { purpose: 'purpose', projectCode: 'project code', notes: 'notes' } as const;

/**
 * A booking moved or its texts edited: the owner hears what changed, and by whom when a lab manager changed
 * someone else's booking. A manager changing their own maintenance block needs no message about it.
 */
export async function queueBookingChanged(transaction: Transaction, lab: BookingMailLab, bookingId: number, actor: { id: number; name: string }, before: BookingTexts): Promise<void> {
  const b = await loadBooking(bookingId, transaction);
  const byOwner = actor.id === b.ownerId;
  if (b.kind === 'maintenance' && byOwner) return;
  const moved = before.startsAt.getTime() !== b.startsAt.getTime() || before.endsAt.getTime() !== b.endsAt.getTime();
  const editedTexts = (Object.keys(textLabels) as (keyof typeof textLabels)[]).filter((k) => before[k] !== b[k]).map((k) => textLabels[k]);
  if (!moved && !editedTexts.length) return;
  await enqueueForUser(transaction, 'booking-changed', b.ownerId, (r) =>
    bookingChangedMail(lab, r.name, b, { movedFrom: moved ? { startsAt: before.startsAt, endsAt: before.endsAt } : null, editedTexts, changedBy: byOwner ? null : actor.name }),
  );
}

/** A cancelled booking: the owner gets the reason and who cancelled (a manager's own maintenance block: nothing). */
export async function queueBookingCancelled(transaction: Transaction, lab: BookingMailLab, bookingId: number, actor: { id: number; name: string }, reason: string): Promise<void> {
  const b = await loadBooking(bookingId, transaction);
  const byOwner = actor.id === b.ownerId;
  if (b.kind === 'maintenance' && byOwner) return;
  await enqueueForUser(transaction, 'booking-cancelled', b.ownerId, (r) => bookingCancelledMail(lab, r.name, b, { reason, cancelledBy: actor.name, byOwner }));
}

/** Marked no-show by the sweep: the owner learns why and from when the rest of the slot was released. */
export async function queueNoShow(transaction: Transaction, lab: BookingMailLab, bookingId: number, releasedFrom: Date): Promise<void> {
  const b = await loadBooking(bookingId, transaction);
  await enqueueForUser(transaction, 'booking-no-show', b.ownerId, (r) => noShowMail(lab, r.name, b, releasedFrom, NO_SHOW_AFTER_MINUTES));
}

interface NextRow {
  booking_id: number;
  owner_id: number;
  starts_at: Date;
  ends_at: Date;
}

/**
 * The first active booking of `kind` on an instrument starting after `after` (and before `before`, when given),
 * through booking_instruments (instrument_id, starts_at).
 */
async function nextOfKind(transaction: Transaction, instrumentId: number, kind: MailBooking['kind'], after: Date, exceptBookingId: number, before: Date | null): Promise<NextRow | undefined> {
  const [row] = await db().query<NextRow>(
    `SELECT bi.booking_id, bk.owner_id, bk.starts_at, bk.ends_at
       FROM booking_instruments bi JOIN bookings bk ON bk.id = bi.booking_id
      WHERE bi.instrument_id = :instrumentId AND bi.starts_at > :after AND (:before::timestamptz IS NULL OR bi.starts_at < :before)
        AND bi.active AND bi.booking_id <> :exceptBookingId AND bk.kind = :kind AND bk.status IN ('confirmed', 'checked-in')
      ORDER BY bi.starts_at LIMIT 1`,
    { replacements: { instrumentId, after, before, exceptBookingId, kind }, type: QueryTypes.SELECT, transaction },
  );
  return row;
}

/**
 * A checked-out booking: for each of its instruments, the next active booking (kind 'booking', not a maintenance
 * block) of that instrument, and a maintenance block that comes before it, whose owner (a lab manager) works on
 * the bench first; every owner of those (except whoever checked out) gets one handover message naming their
 * bookings and blocks, with the note, what was left connected, the latest setup recorded for the checked-out
 * booking and when the bench became free. Handover messages cannot be switched off (topicOf('handover') is
 * null), so enqueueForUser always queues them.
 */
export async function queueHandover(transaction: Transaction, lab: BookingMailLab, bookingId: number, checkedOutBy: { id: number; name: string }, checkedOutAt: Date): Promise<number> {
  const b = await loadBooking(bookingId, transaction);
  const [state] = await db().query<{ handover_note: string; left_connected: string | null }>('SELECT handover_note, left_connected FROM bookings WHERE id = :id', {
    replacements: { id: bookingId },
    type: QueryTypes.SELECT,
    transaction,
  });
  // The next bookings of each instrument: the first active ones starting after this booking's start. Instrument
  // bookings never overlap, so those are the ones that follow this booking: normally at or after the check-out
  // time, or already begun when the check-out comes late.
  const next = new Map<number, { owner: number; kind: MailBooking['kind']; startsAt: Date; endsAt: Date; instruments: MailInstrument[] }>();
  const add = (row: NextRow | undefined, kind: MailBooking['kind'], instrument: MailInstrument) => {
    if (!row || row.owner_id === checkedOutBy.id) return;
    const entry = next.get(row.booking_id) ?? { owner: row.owner_id, kind, startsAt: new Date(row.starts_at), endsAt: new Date(row.ends_at), instruments: [] };
    entry.instruments.push(instrument);
    next.set(row.booking_id, entry);
  };
  for (const instrument of b.instruments) {
    const booking = await nextOfKind(transaction, instrument.id, 'booking', b.startsAt, bookingId, null);
    add(booking, 'booking', instrument);
    add(await nextOfKind(transaction, instrument.id, 'maintenance', b.startsAt, bookingId, booking ? new Date(booking.starts_at) : null), 'maintenance', instrument);
  }
  if (!next.size) return 0;

  const [setup] = await db().query<{ id: number; title: string }>(
    // setups_booking_id_idx; the one saved last is what stays on the bench.
    'SELECT id, title FROM setups WHERE booking_id = :bookingId ORDER BY updated_at DESC, id DESC LIMIT 1',
    { replacements: { bookingId }, type: QueryTypes.SELECT, transaction },
  );
  const byOwner = new Map<number, HandoverNext[]>();
  for (const [id, n] of [...next].sort((x, y) => x[1].startsAt.getTime() - y[1].startsAt.getTime())) {
    byOwner.set(n.owner, [...(byOwner.get(n.owner) ?? []), { bookingId: id, kind: n.kind, startsAt: n.startsAt, endsAt: n.endsAt, instruments: n.instruments }]);
  }
  let queued = 0;
  for (const [ownerId, bookings] of byOwner) {
    const id = await enqueueForUser(transaction, 'handover', ownerId, (r) =>
      handoverMail(lab, r.name, {
        checkedOutBy: checkedOutBy.name,
        previousBooker: b.ownerName,
        checkedOutAt,
        freed: b.instruments,
        note: state!.handover_note,
        leftConnected: state!.left_connected || null,
        setup: setup ?? null,
        next: bookings,
      }),
    );
    if (id !== null) queued += 1;
  }
  return queued;
}

/**
 * An offered waitlist entry: the person waiting gets the offered range (the freed part of the time they wait for)
 * and the link that books it if it is still free.
 */
export async function queueWaitlistOffer(transaction: Transaction, lab: BookingMailLab, entryId: number, offered: { from: Date; to: Date }): Promise<void> {
  const [entry] = await db().query<{ user_id: number; starts_at: Date; ends_at: Date; note: string; instrument: MailInstrument }>(
    `SELECT w.user_id, w.starts_at, w.ends_at, w.note, json_build_object('id', i.id, 'tag', i.tag, 'name', i.name, 'location', i.location) AS instrument
       FROM waitlist_entries w JOIN instruments i ON i.id = w.instrument_id WHERE w.id = :entryId`,
    { replacements: { entryId }, type: QueryTypes.SELECT, transaction },
  );
  if (!entry) return;
  await enqueueForUser(transaction, 'waitlist-offer', entry.user_id, (r) =>
    waitlistOfferMail(lab, r.name, {
      entryId,
      instrument: entry.instrument,
      startsAt: offered.from,
      endsAt: offered.to,
      waitedFrom: new Date(entry.starts_at),
      waitedTo: new Date(entry.ends_at),
      note: entry.note,
    }),
  );
}
