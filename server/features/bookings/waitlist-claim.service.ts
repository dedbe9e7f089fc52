// Claiming a freed slot from the link of a waitlist offer: the offered range is booked through createBooking (every
// booking rule, the exclusion constraint, the confirmation message) and the entry is marked fulfilled in the same
// transaction; a claim that fails puts the entry back to waiting. Kept apart from waitlist.service.ts, which bookings.service.ts itself imports.
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
  offered_starts_at: Date | null;
  offered_ends_at: Date | null;
  note: string;
  status: 'waiting' | 'offered' | 'withdrawn' | 'fulfilled';
}

const notOpen: Record<Exclude<EntryRow['status'], 'offered'>, string> = {
  waiting: 'This slot has not been freed yet: you will get an e-mail with a link as soon as it is.',
  withdrawn: 'You left this waitlist, so the offer is no longer open.',
  fulfilled: 'You have already booked this slot from the offer: it is in My bookings.',
};

const stay = 'you stay on the waitlist and get another e-mail when time you are waiting for becomes free again.';

/**
 * The offer could not be taken up: the entry goes back to waiting, without its offered range, so the next freed
 * time is offered to it again (in its old place in the queue). In a transaction that locks the entry, so an
 * entry that a concurrent claim fulfilled, or that was withdrawn meanwhile, stays as it is. Returns the status
 * the entry has now.
 */
async function backToWaiting(entryId: number): Promise<EntryRow['status'] | null> {
  return db().transaction(async (transaction) => {
    const [row] = await db().query<{ status: EntryRow['status'] }>('SELECT status FROM waitlist_entries WHERE id = :entryId FOR UPDATE', {
      replacements: { entryId },
      type: QueryTypes.SELECT,
      transaction,
    });
    if (row?.status !== 'offered') return row?.status ?? null;
    await db().query(`UPDATE waitlist_entries SET status = 'waiting', offered_at = NULL, offered_starts_at = NULL, offered_ends_at = NULL WHERE id = :entryId`, {
      replacements: { entryId },
      transaction,
    });
    return 'waiting';
  });
}

/**
 * POST /api/waitlist/:id/claim: the person an entry belongs to books its instrument for exactly the offered range
 * (the freed part of the time they wait for; from the current minute on, if it has already begun: the past part
 * cannot be booked). Refused with 409 when the offer is not open or the slot was taken again, with the rule's 422
 * when a booking rule stands in the way; in those two cases the entry goes back to waiting, and the details say
 * so (`entryStatus`) together with the range that was offered (`offered`).
 */
export async function claimWaitlistOffer(user: SessionUser, entryId: number, clock: Clock, lab: MailLab): Promise<Booking> {
  const [entry] = await db().query<EntryRow>(
    `SELECT w.id, w.user_id, w.instrument_id, i.tag, w.starts_at, w.ends_at, w.offered_starts_at, w.offered_ends_at, w.note, w.status
       FROM waitlist_entries w JOIN instruments i ON i.id = w.instrument_id WHERE w.id = :entryId`,
    { replacements: { entryId }, type: QueryTypes.SELECT },
  );
  if (!entry) throw notFound('Waitlist entry');
  if (entry.user_id !== user.id) throw forbidden('This offer was made to someone else on the waitlist.');
  if (entry.status !== 'offered') throw closed(notOpen[entry.status], entry.status);
  // An offered entry always has its range (waitlist_entries_offer_has_range_check).
  const offeredStart = new Date(entry.offered_starts_at!);
  const end = new Date(entry.offered_ends_at!);
  const offered = { startsAt: offeredStart.toISOString(), endsAt: end.toISOString() };
  if (end <= clock.now) {
    // The freed time passed unclaimed; while the person's own time is still ahead, they keep waiting for it.
    const status = new Date(entry.ends_at) > clock.now ? await backToWaiting(entryId) : entry.status;
    if (status === 'waiting') throw new AppError(409, 'invalid_state', `The freed time of ${entry.tag} is already over, but ${stay}`, { entryStatus: status, offered });
    throw closed(`The freed time of ${entry.tag} is already over.`, status ?? 'closed');
  }
  // From the start of the current minute, within the booking rules' minute of slack for "not in the past".
  const start = new Date(Math.max(offeredStart.getTime(), Math.floor(clock.now.getTime() / 60_000) * 60_000));

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
    if (!(err instanceof AppError) || (err.code !== 'booking_clash' && err.code !== 'booking_rule')) throw err;
    const status = await backToWaiting(entryId);
    // A second claim that ran into the first one's booking: the offer was taken up, by this same person.
    if (status !== 'waiting') throw closed(status === 'fulfilled' || status === 'withdrawn' ? notOpen[status] : 'This offer is no longer open.', status ?? 'closed');
    const details = { ...(err.details as object | undefined), entryStatus: status, offered };
    if (err.code === 'booking_clash') {
      throw new AppError(409, 'booking_clash', `${entry.tag} was booked again before you claimed it, so the freed time is no longer free; ${stay}`, details);
    }
    throw new AppError(err.status, err.code, `${err.message} The freed time was not booked, but ${stay}`, details);
  }
}
