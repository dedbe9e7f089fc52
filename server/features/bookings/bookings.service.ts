import { QueryTypes, type Transaction } from 'sequelize';
import { bookingRuleIssues, type RuleInstrument } from '../../../shared/domain/booking-rules.js';
import { dateInZone } from '../../../shared/domain/calibration.js';
import { hasRole } from '../../../shared/domain/roles.js';
import {
  CHECK_IN_EARLY_MINUTES,
  NO_SHOW_AFTER_MINUTES,
  type Booking,
  type BookingEvent,
  type CheckOutInput,
  type Clash,
  type CreateBookingInput,
  type ListBookingsQuery,
  type UpdateBookingInput,
} from '../../../shared/schemas/bookings.js';
import type { SessionUser } from '../../../shared/schemas/people.js';
import { AppError, forbidden, notFound } from '../../lib/errors.js';
import type { MailLab } from '../mail/templates/compose.js';
import { mailLab, queueBookingCancelled, queueBookingChanged, queueBookingConfirmed, queueHandover, queueNoShow, type BookingMailLab } from './booking.mail.js';
import { BookingModel } from './booking.model.js';
import { bookingJson, rangeQuery } from './bookings.sql.js';
import { offerFreedSlot } from './waitlist.service.js';

const db = () => BookingModel.sequelize!;

/** Who sees what: visitors see instrument and time only. */
function viewer(user: SessionUser) {
  return { viewerId: user.id, isManager: user.role === 'manager', seesDetails: hasRole(user.role, 'researcher') };
}

const invalidState = (message: string) => new AppError(409, 'invalid_state', message);

// ---------------------------------------------------------------- reading

/** The calendar's range read, as the JSON text of `{"bookings":[...]}` built by PostgreSQL. */
export async function listBookingsJson(user: SessionUser, query: ListBookingsQuery): Promise<string> {
  const withInstruments = Boolean(query.instrumentId?.length);
  const [row] = await db().query<{ json: string }>(rangeQuery(withInstruments), {
    replacements: { ...viewer(user), from: query.from, to: query.to, instrumentIds: query.instrumentId ?? [] },
    type: QueryTypes.SELECT,
  });
  return `{"bookings":${row!.json}}`;
}

async function bookingsWhere(user: SessionUser, where: string, replacements: Record<string, unknown>, order = 'bk.starts_at', transaction?: Transaction): Promise<Booking[]> {
  const [row] = await db().query<{ list: Booking[] | null }>(
    `SELECT json_agg(${bookingJson} ORDER BY ${order}) AS list FROM bookings bk WHERE ${where}`,
    { replacements: { ...viewer(user), ...replacements }, type: QueryTypes.SELECT, transaction },
  );
  return row?.list ?? [];
}

async function oneBooking(user: SessionUser, id: number, transaction?: Transaction): Promise<Booking> {
  const [booking] = await bookingsWhere(user, 'bk.id = :id', { id }, 'bk.id', transaction);
  if (!booking) throw notFound('Booking');
  return booking;
}

export async function getBooking(user: SessionUser, id: number): Promise<{ booking: Booking; events: BookingEvent[] }> {
  const booking = await oneBooking(user, id);
  const events = await db().query<BookingEvent>(
    `SELECT e.id, to_char(e.at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS at, e.action, e.before, e.after,
            CASE WHEN u.id IS NULL THEN NULL ELSE json_build_object('id', u.id, 'name', u.name) END AS actor
       FROM booking_events e LEFT JOIN users u ON u.id = e.actor_id
      WHERE e.booking_id = :id ORDER BY e.at, e.id`,
    { replacements: { id }, type: QueryTypes.SELECT },
  );
  // Visitors see that something happened, not the texts people wrote.
  const visible = hasRole(user.role, 'researcher') ? events : events.map((e) => ({ ...e, actor: null, before: null, after: null }));
  return { booking, events: visible };
}

/** The caller's bookings: upcoming (not yet ended) in time order, past newest first (the last 50). */
export async function myBookings(user: SessionUser, now: Date): Promise<{ upcoming: Booking[]; past: Booking[] }> {
  const [upcoming, past] = await Promise.all([
    bookingsWhere(user, `bk.owner_id = :viewerId AND bk.ends_at > :now AND bk.status IN ('confirmed', 'checked-in')`, { now }),
    bookingsWhere(
      user,
      `bk.id IN (SELECT id FROM bookings WHERE owner_id = :viewerId AND (ends_at <= :now OR status NOT IN ('confirmed', 'checked-in')) ORDER BY starts_at DESC LIMIT 50)`,
      { now },
      'bk.starts_at DESC',
    ),
  ]);
  return { upcoming, past };
}

// ---------------------------------------------------------------- checking

interface InstrumentRow extends RuleInstrument {
  minGapMinutes: number;
}

async function loadInstruments(ids: number[], transaction?: Transaction): Promise<InstrumentRow[]> {
  const rows = await db().query<InstrumentRow>(
    `SELECT id, tag, status, to_char(calibration_due_on, 'YYYY-MM-DD') AS "calibrationDueOn", qualification_required AS "qualificationRequired",
            max_booking_hours AS "maxBookingHours", advance_days AS "advanceDays", min_gap_minutes AS "minGapMinutes"
       FROM instruments WHERE id IN (:ids)`,
    { replacements: { ids }, type: QueryTypes.SELECT, transaction },
  );
  const missing = ids.filter((id) => !rows.some((r) => r.id === id));
  if (missing.length) {
    throw new AppError(400, 'validation_failed', 'Some instruments do not exist.', [{ path: 'instrumentIds', message: `No instrument with id ${missing.join(', ')}` }]);
  }
  return ids.map((id) => rows.find((r) => r.id === id)!);
}

async function qualifiedFor(userId: number, ids: number[]): Promise<Set<number>> {
  const rows = await db().query<{ instrument_id: number }>(
    'SELECT instrument_id FROM instrument_qualifications WHERE user_id = :userId AND instrument_id IN (:ids)',
    { replacements: { userId, ids }, type: QueryTypes.SELECT },
  );
  return new Set(rows.map((r) => r.instrument_id));
}

interface Neighbour extends Clash {
  overlaps: boolean;
}

/**
 * Active bookings of these instruments that overlap [start, end) or come closer than the instrument's gap.
 * `overlaps` tells a real clash from a gap violation.
 */
async function neighbours(user: SessionUser, instruments: InstrumentRow[], start: Date, end: Date, exceptBookingId: number | null): Promise<Neighbour[]> {
  const seesOwner = hasRole(user.role, 'researcher');
  const rows: Neighbour[] = [];
  for (const i of instruments) {
    const found = await db().query<Neighbour>(
      `SELECT bi.instrument_id AS "instrumentId", :tag AS tag, bk.kind,
              to_char(bk.starts_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "startsAt",
              to_char(bi.ends_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "endsAt",
              CASE WHEN :seesOwner THEN u.name END AS owner,
              (bi.starts_at < :end AND bi.ends_at > :start) AS overlaps
         FROM booking_instruments bi JOIN bookings bk ON bk.id = bi.booking_id JOIN users u ON u.id = bk.owner_id
        WHERE bi.instrument_id = :instrumentId AND bi.active
          AND bi.starts_at < (:end)::timestamptz + make_interval(mins => :gap)
          AND bi.starts_at > (:start)::timestamptz - interval '15 days'
          AND bi.blocked_until > :start
          AND (:except::int IS NULL OR bi.booking_id <> :except)
        ORDER BY bi.starts_at`,
      { replacements: { tag: i.tag, seesOwner, start, end, instrumentId: i.id, gap: i.minGapMinutes, except: exceptBookingId }, type: QueryTypes.SELECT },
    );
    rows.push(...found);
  }
  return rows;
}

function clashError(clashes: Clash[]): AppError {
  const first = clashes[0]!;
  return new AppError(409, 'booking_clash', `${first.tag} is already ${first.kind === 'maintenance' ? 'blocked for maintenance' : 'booked'} in that time${clashes.length > 1 ? ', and so are other slots' : ''}.`, {
    clashes: clashes.map(({ instrumentId, tag, startsAt, endsAt, kind, owner }) => ({ instrumentId, tag, startsAt, endsAt, kind, owner })),
  });
}

/** Refuse with the clashes (409) or the broken rules (422), in that order. */
async function assertBookable(
  user: SessionUser,
  instruments: InstrumentRow[],
  start: Date,
  end: Date,
  options: { now: Date; timeZone: string; maintenance: boolean; overrideCalibration: boolean; exceptBookingId: number | null },
) {
  const near = await neighbours(user, instruments, start, end, options.exceptBookingId);
  const clashes = near.filter((n) => n.overlaps);
  if (clashes.length) throw clashError(clashes);
  if (options.maintenance) return;

  const qualified = await qualifiedFor(user.id, instruments.map((i) => i.id));
  const issues = bookingRuleIssues(instruments, {
    startsAtMs: start.getTime(),
    endsAtMs: end.getTime(),
    nowMs: options.now.getTime(),
    firstDay: dateInZone(start, options.timeZone),
    lastDay: dateInZone(new Date(end.getTime() - 1), options.timeZone),
    isManager: user.role === 'manager',
    overrideCalibration: options.overrideCalibration,
    qualified: (id) => qualified.has(id),
  });
  for (const n of near.filter((x) => !x.overlaps)) {
    const gap = instruments.find((i) => i.id === n.instrumentId)!.minGapMinutes;
    issues.push({ rule: 'too-close', instrumentId: n.instrumentId, message: `${n.tag} needs ${gap} minutes between bookings; the neighbouring booking ${n.owner ? `of ${n.owner} ` : ''}is closer than that.` });
  }
  if (issues.length) {
    throw new AppError(422, 'booking_rule', issues.length === 1 ? issues[0]!.message : `The booking breaks ${issues.length} rules.`, { issues });
  }
}

function isExclusionViolation(err: unknown): boolean {
  const parent = (err as { parent?: { code?: string }; original?: { code?: string } }).parent ?? (err as { original?: { code?: string } }).original;
  return parent?.code === '23P01';
}

async function audit(bookingId: number, actorId: number | null, action: string, before: unknown, after: unknown, transaction: Transaction) {
  await db().query('INSERT INTO booking_events (booking_id, actor_id, action, before, after) VALUES (:bookingId, :actorId, :action, :before, :after)', {
    replacements: { bookingId, actorId, action, before: before === null ? null : JSON.stringify(before), after: after === null ? null : JSON.stringify(after) },
    transaction,
  });
}

// ---------------------------------------------------------------- writing

export interface Clock {
  now: Date;
  timeZone: string;
}

/**
 * Book one or more instruments for one time range: all or nothing, in one transaction. The exclusion
 * constraint decides races between simultaneous requests; the loser gets the same 409 as a pre-checked clash.
 * The owner's confirmation is queued in the same transaction; `inTransaction` runs first in it, so a caller
 * (a waitlist claim) can lock and write its own rows all or nothing with the booking.
 */
export async function createBooking(
  user: SessionUser,
  input: CreateBookingInput,
  clock: Clock,
  lab: MailLab,
  options: { inTransaction?: (transaction: Transaction) => Promise<void> } = {},
): Promise<Booking> {
  const maintenance = input.kind === 'maintenance';
  if (!hasRole(user.role, 'researcher')) throw forbidden('Visitors cannot book instruments.');
  if (maintenance && user.role !== 'manager') throw forbidden('Only lab managers add maintenance blocks.');
  if (input.overrideCalibration && user.role !== 'manager') throw forbidden('Only a lab manager may override an overdue calibration.');
  const start = new Date(input.startsAt);
  const end = new Date(input.endsAt);
  const instruments = await loadInstruments(input.instrumentIds);
  await assertBookable(user, instruments, start, end, { ...clock, maintenance, overrideCalibration: Boolean(input.overrideCalibration), exceptBookingId: null });
  const overridden = !maintenance && input.overrideCalibration && instruments.some((i) => i.calibrationDueOn !== null && i.calibrationDueOn < dateInZone(new Date(end.getTime() - 1), clock.timeZone));

  try {
    const id = await db().transaction(async (transaction) => {
      await options.inTransaction?.(transaction);
      const row = await BookingModel.create(
        {
          kind: maintenance ? 'maintenance' : 'booking',
          ownerId: user.id,
          startsAt: start,
          endsAt: end,
          purpose: input.purpose,
          projectCode: input.projectCode ?? '',
          notes: input.notes ?? '',
          calibrationOverrideBy: overridden ? user.id : null,
        },
        { transaction },
      );
      for (const i of instruments) {
        await db().query(
          `INSERT INTO booking_instruments (booking_id, instrument_id, starts_at, ends_at, blocked_until)
           VALUES (:bookingId, :instrumentId, :start, :end, (:end)::timestamptz + make_interval(mins => :gap))`,
          { replacements: { bookingId: row.id, instrumentId: i.id, start, end, gap: maintenance ? 0 : i.minGapMinutes }, transaction },
        );
      }
      await audit(row.id, user.id, 'created', null, { instruments: instruments.map((i) => i.tag), startsAt: start.toISOString(), endsAt: end.toISOString(), purpose: input.purpose }, transaction);
      if (overridden) await audit(row.id, user.id, 'calibration-override', null, { instruments: instruments.filter((i) => i.calibrationDueOn).map((i) => `${i.tag} due ${i.calibrationDueOn}`) }, transaction);
      await queueBookingConfirmed(transaction, mailLab(lab, clock.timeZone), row.id, clock.now);
      return row.id;
    });
    return oneBooking(user, id);
  } catch (err) {
    if (isExclusionViolation(err)) {
      const near = await neighbours(user, instruments, start, end, null);
      throw clashError(near.length ? near : [{ instrumentId: instruments[0]!.id, tag: instruments[0]!.tag, startsAt: start.toISOString(), endsAt: end.toISOString(), kind: 'booking', owner: null }]);
    }
    throw err;
  }
}

async function lockOwned(user: SessionUser, id: number, transaction: Transaction): Promise<BookingModel> {
  const row = await BookingModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw notFound('Booking');
  if (row.ownerId !== user.id && user.role !== 'manager') throw forbidden('Only the person who booked it or a lab manager may change this booking.');
  return row;
}

async function instrumentIdsOf(bookingId: number, transaction?: Transaction): Promise<number[]> {
  const rows = await db().query<{ instrument_id: number }>('SELECT instrument_id FROM booking_instruments WHERE booking_id = :bookingId ORDER BY instrument_id', {
    replacements: { bookingId },
    type: QueryTypes.SELECT,
    transaction,
  });
  return rows.map((r) => r.instrument_id);
}

/**
 * The parts of `old` that `kept` does not cover, in time order: none when the new range covers the old one, one
 * when they overlap at one end or not at all, two when the new range sits inside the old one.
 */
function uncoveredParts(old: { from: Date; to: Date }, kept: { from: Date; to: Date }): { from: Date; to: Date }[] {
  const parts: { from: Date; to: Date }[] = [];
  const beforeEnd = new Date(Math.min(old.to.getTime(), kept.from.getTime()));
  if (old.from < beforeEnd) parts.push({ from: old.from, to: beforeEnd });
  const afterStart = new Date(Math.max(old.from.getTime(), kept.to.getTime()));
  if (afterStart < old.to) parts.push({ from: afterStart, to: old.to });
  return parts;
}

/** Move a booking (drag, resize) or change its texts; every rule is checked again. */
export async function updateBooking(user: SessionUser, id: number, patch: UpdateBookingInput, clock: Clock, lab: MailLab): Promise<Booking> {
  if (patch.overrideCalibration && user.role !== 'manager') throw forbidden('Only a lab manager may override an overdue calibration.');
  const current = await BookingModel.findByPk(id);
  if (!current) throw notFound('Booking');
  if (current.ownerId !== user.id && user.role !== 'manager') throw forbidden('Only the person who booked it or a lab manager may change this booking.');
  if (current.status !== 'confirmed') throw invalidState(`This booking is ${current.status} and can no longer be changed.`);
  const start = patch.startsAt ? new Date(patch.startsAt) : current.startsAt;
  const end = patch.endsAt ? new Date(patch.endsAt) : current.endsAt;
  if (end <= start) throw new AppError(400, 'validation_failed', 'Some fields are not valid.', [{ path: 'endsAt', message: 'The end must be after the start' }]);
  const moved = start.getTime() !== current.startsAt.getTime() || end.getTime() !== current.endsAt.getTime();
  const instruments = await loadInstruments(await instrumentIdsOf(id));
  if (moved) {
    await assertBookable(user, instruments, start, end, { ...clock, maintenance: current.kind === 'maintenance', overrideCalibration: Boolean(patch.overrideCalibration), exceptBookingId: id });
  }
  try {
    await db().transaction(async (transaction) => {
      const row = await lockOwned(user, id, transaction);
      const before = { startsAt: row.startsAt.toISOString(), endsAt: row.endsAt.toISOString(), purpose: row.purpose, projectCode: row.projectCode, notes: row.notes };
      await row.update(
        { startsAt: start, endsAt: end, purpose: patch.purpose ?? row.purpose, projectCode: patch.projectCode ?? row.projectCode, notes: patch.notes ?? row.notes },
        { transaction },
      );
      if (moved) {
        await db().query(
          `UPDATE booking_instruments bi SET starts_at = :start, ends_at = :end,
                  blocked_until = (:end)::timestamptz + make_interval(mins => CASE WHEN :maintenance THEN 0 ELSE i.min_gap_minutes END)
             FROM instruments i WHERE i.id = bi.instrument_id AND bi.booking_id = :id`,
          { replacements: { start, end, id, maintenance: row.kind === 'maintenance' }, transaction },
        );
      }
      const after = { startsAt: start.toISOString(), endsAt: end.toISOString(), purpose: row.purpose, projectCode: row.projectCode, notes: row.notes };
      const changed = Object.keys(after).filter((k) => after[k as keyof typeof after] !== before[k as keyof typeof before]);
      if (changed.length) {
        await audit(id, user.id, moved ? 'moved' : 'edited', Object.fromEntries(changed.map((k) => [k, before[k as keyof typeof before]])), Object.fromEntries(changed.map((k) => [k, after[k as keyof typeof after]])), transaction);
      }
      const site = mailLab(lab, clock.timeZone);
      if (moved) {
        // The parts of the old slot that the move gave up may be what someone is waiting for.
        for (const part of uncoveredParts({ from: new Date(before.startsAt), to: new Date(before.endsAt) }, { from: start, to: end })) {
          for (const instrumentId of instruments.map((i) => i.id)) await offerFreedSlot(instrumentId, part.from, part.to, clock.now, transaction, site);
        }
      }
      if (changed.length) await queueBookingChanged(transaction, site, id, user, { ...before, startsAt: new Date(before.startsAt), endsAt: new Date(before.endsAt) });
    });
  } catch (err) {
    if (isExclusionViolation(err)) throw clashError(await neighbours(user, instruments, start, end, id));
    throw err;
  }
  return oneBooking(user, id);
}

/** Check in: the booking's owner (or a manager), from 15 minutes before the start until its end. */
export async function checkIn(user: SessionUser, id: number, clock: Clock): Promise<Booking> {
  await db().transaction(async (transaction) => {
    const row = await lockOwned(user, id, transaction);
    if (row.kind !== 'booking') throw invalidState('Maintenance blocks are not checked in.');
    if (row.status !== 'confirmed') throw invalidState(`This booking is ${row.status}; only a confirmed booking can be checked in.`);
    const opens = row.startsAt.getTime() - CHECK_IN_EARLY_MINUTES * 60_000;
    if (clock.now.getTime() < opens) throw invalidState(`Check-in opens ${CHECK_IN_EARLY_MINUTES} minutes before the start.`);
    if (clock.now.getTime() >= row.endsAt.getTime()) throw invalidState('This booking has already ended.');
    await row.update({ status: 'checked-in', checkedInAt: clock.now }, { transaction });
    await audit(id, user.id, 'checked-in', { status: 'confirmed' }, { status: 'checked-in' }, transaction);
  });
  return oneBooking(user, id);
}

/** Check out with a handover note; leaving early releases the rest of the slot. */
export async function checkOut(user: SessionUser, id: number, input: CheckOutInput, clock: Clock, lab: MailLab): Promise<Booking> {
  const site = mailLab(lab, clock.timeZone);
  await db().transaction(async (transaction) => {
    const row = await lockOwned(user, id, transaction);
    if (row.status !== 'checked-in') throw invalidState(row.status === 'confirmed' ? 'Check in before checking out.' : `This booking is ${row.status}.`);
    await row.update({ status: 'completed', checkedOutAt: clock.now, handoverNote: input.handoverNote, leftConnected: input.leftConnected ?? null }, { transaction });
    if (clock.now < row.endsAt) {
      await db().query(
        // Checked out before the start (check-in opens early): the kept range shrinks to nothing, never below its start.
        `UPDATE booking_instruments bi SET ends_at = GREATEST(:now, bi.starts_at),
                blocked_until = GREATEST(:now, bi.starts_at) + make_interval(mins => i.min_gap_minutes)
           FROM instruments i WHERE i.id = bi.instrument_id AND bi.booking_id = :id`,
        { replacements: { now: clock.now, id }, transaction },
      );
      for (const instrumentId of await instrumentIdsOf(id, transaction)) await offerFreedSlot(instrumentId, clock.now, row.endsAt, clock.now, transaction, site);
    }
    await audit(id, user.id, 'checked-out', { status: 'checked-in' }, { status: 'completed', handoverNote: input.handoverNote, leftConnected: input.leftConnected ?? null }, transaction);
    await queueHandover(transaction, site, id, user, clock.now);
  });
  return oneBooking(user, id);
}

/** Cancel (owner or manager) with a reason; the slot is freed at once and offered to whoever waits for it. */
export async function cancelBooking(user: SessionUser, id: number, reason: string, clock: Clock, lab: MailLab): Promise<Booking> {
  const site = mailLab(lab, clock.timeZone);
  await db().transaction(async (transaction) => {
    const row = await lockOwned(user, id, transaction);
    if (row.status !== 'confirmed') throw invalidState(row.status === 'checked-in' ? 'This booking is in progress: check out instead.' : `This booking is already ${row.status}.`);
    await row.update({ status: 'cancelled', cancelReason: reason, cancelledAt: clock.now, cancelledBy: user.id }, { transaction });
    await db().query('UPDATE booking_instruments SET active = false WHERE booking_id = :id', { replacements: { id }, transaction });
    const from = clock.now > row.startsAt ? clock.now : row.startsAt;
    for (const instrumentId of await instrumentIdsOf(id, transaction)) await offerFreedSlot(instrumentId, from, row.endsAt, clock.now, transaction, site);
    await audit(id, user.id, 'cancelled', { status: 'confirmed' }, { status: 'cancelled', reason }, transaction);
    await queueBookingCancelled(transaction, site, id, user, reason);
  });
  return oneBooking(user, id);
}

/**
 * Mark bookings not checked in 30 minutes after their start as no-show and release the rest of their slot; the
 * owner is told, in the same transaction. Run every minute by the server; returns how many were marked.
 */
export async function markNoShows(now: Date, lab: BookingMailLab): Promise<number> {
  const due = await db().query<{ id: number; ends_at: Date }>(
    `SELECT id, ends_at FROM bookings WHERE status = 'confirmed' AND kind = 'booking' AND starts_at <= :cutoff`,
    { replacements: { cutoff: new Date(now.getTime() - NO_SHOW_AFTER_MINUTES * 60_000) }, type: QueryTypes.SELECT },
  );
  let marked = 0;
  for (const { id } of due) {
    await db().transaction(async (transaction) => {
      const row = await BookingModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
      if (!row || row.status !== 'confirmed') return;
      await row.update({ status: 'no-show' }, { transaction });
      await db().query('UPDATE booking_instruments SET active = false WHERE booking_id = :id', { replacements: { id }, transaction });
      if (now < row.endsAt) for (const instrumentId of await instrumentIdsOf(id, transaction)) await offerFreedSlot(instrumentId, now, row.endsAt, now, transaction, lab);
      await audit(id, null, 'no-show', { status: 'confirmed' }, { status: 'no-show', releasedFrom: now.toISOString() }, transaction);
      await queueNoShow(transaction, lab, id, now);
      marked += 1;
    });
  }
  return marked;
}
