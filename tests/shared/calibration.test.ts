import { describe, expect, it } from 'vitest';
import { calibrationState, dateInZone } from '../../shared/domain/calibration.js';

describe('calibrationState (30-day warning: common practice)', () => {
  it.each([
    [null, 'none', null],
    ['2027-03-01', 'ok', 90],
    ['2026-12-31', 'due-soon', 30],
    ['2026-12-01', 'due-soon', 0],
    ['2026-11-30', 'overdue', -1],
  ] as const)('due %s on 2026-12-01 → %s', (due, state, daysLeft) => {
    expect(calibrationState(due, '2026-12-01')).toEqual({ state, daysLeft });
  });
});

describe('dateInZone', () => {
  it('gives the lab’s calendar date, which can differ from UTC', () => {
    const instant = new Date('2026-12-01T23:30:00Z');
    expect(dateInZone(instant, 'Europe/Berlin')).toBe('2026-12-02');
    expect(dateInZone(instant, 'America/Chicago')).toBe('2026-12-01');
  });
});
