import { describe, expect, it } from 'vitest';
import { bookingRuleIssues, type RuleInstrument } from '../../shared/domain/booking-rules.js';

const ps: RuleInstrument = { id: 1, tag: 'PS-1', status: 'in-service', calibrationDueOn: null, qualificationRequired: true, maxBookingHours: 8, advanceDays: 28 };
const now = Date.parse('2026-12-01T08:00:00Z');
const base = {
  startsAtMs: Date.parse('2026-12-03T12:00:00Z'),
  endsAtMs: Date.parse('2026-12-03T16:00:00Z'),
  nowMs: now,
  firstDay: '2026-12-03',
  lastDay: '2026-12-03',
  isManager: false,
  overrideCalibration: false,
  qualified: () => true,
};
const rules = (instrument: Partial<RuleInstrument>, request: Partial<typeof base> = {}) =>
  bookingRuleIssues([{ ...ps, ...instrument }], { ...base, ...request }).map((i) => i.rule);

describe('bookingRuleIssues (Skewbench booking rules, common practice)', () => {
  it('allows a booking that keeps every rule', () => {
    expect(rules({})).toEqual([]);
  });
  it('refuses maintenance and retired instruments', () => {
    expect(rules({ status: 'maintenance' })).toEqual(['instrument-unavailable']);
    expect(rules({ status: 'retired' })).toEqual(['instrument-unavailable']);
  });
  it('blocks a calibration that is overdue on a booked day, unless a manager overrides', () => {
    expect(rules({ calibrationDueOn: '2026-12-02' })).toEqual(['calibration-overdue']);
    expect(rules({ calibrationDueOn: '2026-12-03' })).toEqual([]); // due on the day itself: not yet overdue
    expect(rules({ calibrationDueOn: '2026-12-02' }, { isManager: true, overrideCalibration: true })).toEqual([]);
    expect(rules({ calibrationDueOn: '2026-12-02' }, { overrideCalibration: true })).toEqual(['calibration-overdue']);
  });
  it('needs the qualification, except for managers', () => {
    expect(rules({}, { qualified: () => false })).toEqual(['qualification-missing']);
    expect(rules({}, { qualified: () => false, isManager: true })).toEqual([]);
  });
  it('limits the length, the advance window and refuses the past', () => {
    expect(rules({ maxBookingHours: 3 })).toEqual(['too-long']);
    expect(rules({ advanceDays: 1 })).toEqual(['beyond-window']);
    expect(rules({}, { startsAtMs: now - 3_600_000, endsAtMs: now })).toEqual(['in-the-past']);
    expect(rules({}, { startsAtMs: now - 30_000 })).not.toContain('in-the-past'); // a minute of slack for the form
  });
});
