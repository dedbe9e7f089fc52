import type { RuleIssue } from '../schemas/bookings.js';
import { MAX_BOOKING_DAYS } from '../schemas/bookings.js';

/** What the booking rules need to know about one instrument. */
export interface RuleInstrument {
  id: number;
  tag: string;
  status: 'in-service' | 'maintenance' | 'retired';
  calibrationDueOn: string | null;
  qualificationRequired: boolean;
  maxBookingHours: number | null;
  advanceDays: number;
}

export interface RuleRequest {
  startsAtMs: number;
  endsAtMs: number;
  nowMs: number;
  /** The lab-calendar dates (YYYY-MM-DD) of the booking's first and last day. */
  firstDay: string;
  lastDay: string;
  /** Whether the person booking is a lab manager (managers need no qualification and may override calibration). */
  isManager: boolean;
  overrideCalibration: boolean;
  /** Whether the person holds the qualification for each instrument, by id. */
  qualified: (instrumentId: number) => boolean;
}

const hours = (ms: number) => ms / 3_600_000;
const fmtHours = (h: number) => `${Number(h.toFixed(2))} h`;

/**
 * Every booking rule that a request breaks, each with its own message; an empty list means the rules allow it.
 * Clashes and minimum gaps between bookings are checked against the database, not here.
 */
export function bookingRuleIssues(instruments: RuleInstrument[], r: RuleRequest): RuleIssue[] {
  const issues: RuleIssue[] = [];
  const add = (rule: RuleIssue['rule'], instrumentId: number | null, message: string) => issues.push({ rule, instrumentId, message });
  const duration = hours(r.endsAtMs - r.startsAtMs);

  // One minute of slack, so a form sent "now" is not refused for the seconds it took to submit.
  if (r.startsAtMs < r.nowMs - 60_000) add('in-the-past', null, 'The booking would start in the past. Choose a later start.');
  if (duration > MAX_BOOKING_DAYS * 24) add('too-long', null, `A booking can last at most ${MAX_BOOKING_DAYS} days.`);

  for (const i of instruments) {
    if (i.status !== 'in-service') {
      add('instrument-unavailable', i.id, `${i.tag} is ${i.status === 'maintenance' ? 'in maintenance' : 'retired'} and cannot be booked.`);
    }
    if (i.calibrationDueOn !== null && i.calibrationDueOn < r.lastDay && !(r.isManager && r.overrideCalibration)) {
      add(
        'calibration-overdue',
        i.id,
        `${i.tag}'s calibration is due on ${i.calibrationDueOn}, so it is overdue on the booked day ${i.calibrationDueOn < r.firstDay ? r.firstDay : r.lastDay}. A lab manager may override this.`,
      );
    }
    if (i.qualificationRequired && !r.isManager && !r.qualified(i.id)) {
      add('qualification-missing', i.id, `${i.tag} needs a qualification you do not hold yet. Ask a lab manager to record your training.`);
    }
    if (i.maxBookingHours !== null && duration > i.maxBookingHours + 1e-9) {
      add('too-long', i.id, `${i.tag} can be booked for at most ${fmtHours(i.maxBookingHours)} at a time; this booking lasts ${fmtHours(duration)}.`);
    }
    if (r.startsAtMs > r.nowMs + i.advanceDays * 86_400_000) {
      add('beyond-window', i.id, `${i.tag} can be booked at most ${i.advanceDays} days ahead.`);
    }
  }
  return issues;
}
