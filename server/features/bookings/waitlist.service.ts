import { QueryTypes, type Transaction } from 'sequelize';
import type { CreateWaitlistInput, WaitlistEntry } from '../../../shared/schemas/bookings.js';
import type { SessionUser } from '../../../shared/schemas/people.js';
import { hasRole } from '../../../shared/domain/roles.js';
import { AppError, forbidden, notFound } from '../../lib/errors.js';
import { queueWaitlistOffer, type BookingMailLab } from './booking.mail.js';
import { BookingModel } from './booking.model.js';
import { isoUtcSql } from '../../lib/sql.js';

const db = () => BookingModel.sequelize!;
const iso = isoUtcSql;

const entryJson = `json_build_object(
  'id', w.id,
  'instrument', json_build_object('id', i.id, 'tag', i.tag, 'name', i.name, 'kind', i.kind),
  'user', json_build_object('id', u.id, 'name', u.name),
  'startsAt', ${iso('w.starts_at')}, 'endsAt', ${iso('w.ends_at')},
  'note', w.note, 'status', w.status, 'offeredAt', ${iso('w.offered_at')},
  'offeredStartsAt', ${iso('w.offered_starts_at')}, 'offeredEndsAt', ${iso('w.offered_ends_at')}, 'createdAt', ${iso('w.created_at')})`;

async function entriesWhere(where: string, replacements: Record<string, unknown>): Promise<WaitlistEntry[]> {
  const [row] = await db().query<{ list: WaitlistEntry[] | null }>(
    `SELECT json_agg(${entryJson} ORDER BY w.starts_at, w.id) AS list
       FROM waitlist_entries w JOIN instruments i ON i.id = w.instrument_id JOIN users u ON u.id = w.user_id WHERE ${where}`,
    { replacements, type: QueryTypes.SELECT },
  );
  return row?.list ?? [];
}

/** Wait for a taken slot of an instrument. A free slot is refused: it can simply be booked. */
export async function joinWaitlist(user: SessionUser, input: CreateWaitlistInput, now: Date): Promise<WaitlistEntry> {
  if (!hasRole(user.role, 'researcher')) throw forbidden('Visitors cannot join a waitlist.');
  const start = new Date(input.startsAt);
  const end = new Date(input.endsAt);
  if (end <= now) throw new AppError(409, 'invalid_state', 'That slot is already over.');
  const [instrument] = await db().query<{ id: number }>('SELECT id FROM instruments WHERE id = :id', { replacements: { id: input.instrumentId }, type: QueryTypes.SELECT });
  if (!instrument) throw notFound('Instrument');
  const [taken] = await db().query<{ n: string }>(
    `SELECT count(*) AS n FROM booking_instruments WHERE instrument_id = :id AND active AND starts_at < :end AND ends_at > :start AND starts_at > (:start)::timestamptz - interval '15 days'`,
    { replacements: { id: input.instrumentId, start, end }, type: QueryTypes.SELECT },
  );
  if (Number(taken!.n) === 0) throw new AppError(409, 'invalid_state', 'That slot is free: book it instead of waiting.');
  const [row] = await db().query<{ id: number }>(
    `INSERT INTO waitlist_entries (instrument_id, user_id, starts_at, ends_at, note) VALUES (:instrumentId, :userId, :start, :end, :note) RETURNING id`,
    { replacements: { instrumentId: input.instrumentId, userId: user.id, start, end, note: input.note ?? '' }, type: QueryTypes.SELECT },
  );
  return (await entriesWhere('w.id = :id', { id: row!.id }))[0]!;
}

/** The caller's entries that still matter: waiting, offered, or for slots not yet over. */
export async function myWaitlist(user: SessionUser, now: Date): Promise<WaitlistEntry[]> {
  return entriesWhere(`w.user_id = :userId AND (w.ends_at > :now OR w.status IN ('waiting', 'offered'))`, { userId: user.id, now });
}

/** Who waits for an instrument (everyone signed in may see the queue; visitors do not see names). */
export async function instrumentWaitlist(user: SessionUser, instrumentId: number, now: Date): Promise<WaitlistEntry[]> {
  const entries = await entriesWhere(`w.instrument_id = :instrumentId AND w.ends_at > :now AND w.status IN ('waiting', 'offered')`, { instrumentId, now });
  return hasRole(user.role, 'researcher') ? entries : entries.map((e) => ({ ...e, user: { id: 0, name: 'someone' }, note: '' }));
}

export async function leaveWaitlist(user: SessionUser, id: number): Promise<void> {
  const [row] = await db().query<{ user_id: number }>('SELECT user_id FROM waitlist_entries WHERE id = :id', { replacements: { id }, type: QueryTypes.SELECT });
  if (!row) throw notFound('Waitlist entry');
  if (row.user_id !== user.id && user.role !== 'manager') throw forbidden('Only the person waiting or a lab manager may remove this entry.');
  await db().query(`UPDATE waitlist_entries SET status = 'withdrawn' WHERE id = :id`, { replacements: { id } });
}

/**
 * A slot of an instrument became free (cancel, no-show, early check-out, move): offer it to the first person
 * waiting for an overlapping time, and queue their message with the claim link in the same transaction.
 * The offer is the part of the freed time that the person waits for and that is still ahead: the intersection
 * of their range and [from, to), from `now` at the earliest; that is what the message shows and a claim books.
 * SKIP LOCKED keeps two freeing transactions from offering the same entry.
 */
export async function offerFreedSlot(instrumentId: number, from: Date, to: Date, now: Date, transaction: Transaction, lab: BookingMailLab): Promise<number | null> {
  if (to <= now || to <= from) return null;
  // Overlapping [from, to) and not over: the intersection with [now, ∞) is then never empty.
  const [first] = await db().query<{ id: number; offered_starts_at: Date; offered_ends_at: Date }>(
    `SELECT id, GREATEST(starts_at, (:from)::timestamptz, (:now)::timestamptz) AS offered_starts_at, LEAST(ends_at, (:to)::timestamptz) AS offered_ends_at
       FROM waitlist_entries
      WHERE instrument_id = :instrumentId AND status = 'waiting' AND starts_at < :to AND ends_at > :from AND ends_at > :now
        AND starts_at > (:from)::timestamptz - interval '15 days'
      ORDER BY created_at, id LIMIT 1 FOR UPDATE SKIP LOCKED`,
    { replacements: { instrumentId, from, to, now }, type: QueryTypes.SELECT, transaction },
  );
  if (!first) return null;
  const offered = { from: new Date(first.offered_starts_at), to: new Date(first.offered_ends_at) };
  await db().query(`UPDATE waitlist_entries SET status = 'offered', offered_at = :now, offered_starts_at = :from, offered_ends_at = :to WHERE id = :id`, {
    replacements: { id: first.id, now, ...offered },
    transaction,
  });
  await queueWaitlistOffer(transaction, lab, first.id, offered);
  return first.id;
}
