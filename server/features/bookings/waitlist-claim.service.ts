// Claiming a freed slot from the link of a waitlist offer: the slot is booked through createBooking (every booking
// rule, the exclusion constraint, the confirmation message) and the entry is marked fulfilled in the same
// transaction. Kept apart from waitlist.service.ts, which bookings.service.ts itself imports.
import { QueryTypes } from 'sequelize';
import type { Booking } from '../../../shared/schemas/bookings.js';
import type { SessionUser } from '../../../shared/schemas/people.js';
import { AppError, forbidden, notFound } from '../../lib/errors.js';
import type { MailLab } from '../mail/templates/compose.js';
import { BookingModel } from './booking.model.js';
import { createBooking, type Clock } from './bookings.service.js';

const db = () => BookingModel.sequelize!;
/** The offer is not open; `details.entryStatus` says what became of the entry (the claim page words its links by it). */
const closed = (message: string, entryStatus: string) => new AppError(409, 'invalid_state', message, { entryStatus });

interface EntryRow {
  id: number;
  user_id: number;
  instrument_id: number;
  tag: string;
  starts_at: Date;
  ends_at: Date;
  note: string;
  status: 'waiting' | 'offered' | 'withdrawn' | 'fulfilled';
}

const notOpen: Record<Exclude<EntryRow['status'], 'offered'>, string> = {
  waiting: 'This slot has not been freed yet: you will get an e-mail with a link as soon as it is.',
  withdrawn: 'You left this waitlist, so the offer is no longer open.',
  fulfilled: 'You have already booked this slot from the offer: it is in My bookings.',
};

/**
 * POST /api/waitlist/:id/claim: the person an entry belongs to books its instrument for its time range (from now
 * on, if the slot has already begun: the past part cannot be booked). Refused with 409 when the offer is not open
 * or the slot was taken again, with the rule's 422 when a booking rule stands in the way.
 */
export async function claimWaitlistOffer(user: SessionUser, entryId: number, clock: Clock, lab: MailLab): Promise<Booking> {
  const [entry] = await db().query<EntryRow>(
    `SELECT w.id, w.user_id, w.instrument_id, i.tag, w.starts_at, w.ends_at, w.note, w.status
       FROM waitlist_entries w JOIN instruments i ON i.id = w.instrument_id WHERE w.id = :entryId`,
    { replacements: { entryId }, type: QueryTypes.SELECT },
  );
  if (!entry) throw notFound('Waitlist entry');
  if (entry.user_id !== user.id) throw forbidden('This offer was made to someone else on the waitlist.');
  if (entry.status !== 'offered') throw closed(notOpen[entry.status], entry.status);
  const end = new Date(entry.ends_at);
  if (end <= clock.now) throw closed(`The slot of ${entry.tag} is already over.`, entry.status);
  // From the start of the current minute, within the booking rules' minute of slack for "not in the past".
  const start = new Date(Math.max(new Date(entry.starts_at).getTime(), Math.floor(clock.now.getTime() / 60_000) * 60_000));

  try {
    return await createBooking(
      user,
      { instrumentIds: [entry.instrument_id], startsAt: start.toISOString(), endsAt: end.toISOString(), purpose: 'Freed slot from the waitlist', notes: entry.note || undefined },
      clock,
      lab,
      {
        // Locks the entry first, so a second claim (a double click, two tabs) waits here and then finds it fulfilled.
        inTransaction: async (transaction) => {
          const claimed = await db().query<{ id: number }>(
            `UPDATE waitlist_entries SET status = 'fulfilled' WHERE id = :entryId AND user_id = :userId AND status = 'offered' RETURNING id`,
            { replacements: { entryId, userId: user.id }, type: QueryTypes.SELECT, transaction },
          );
          if (!claimed.length) throw closed('This offer is no longer open: it was claimed or withdrawn a moment ago.', 'closed');
        },
      },
    );
  } catch (err) {
    if (err instanceof AppError && err.code === 'booking_clash') {
      throw new AppError(409, 'booking_clash', `${entry.tag} was booked again before you claimed it: the slot is no longer free.`, err.details);
    }
    throw err;
  }
}
