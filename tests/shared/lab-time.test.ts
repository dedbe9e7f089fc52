import { describe, expect, it } from 'vitest';
import { addDays, labWallTimeToUtc, zoneOffsetMinutes } from '../../shared/domain/lab-time.js';

// Europe/Berlin is UTC+1 in winter and UTC+2 from the last Sunday of March (EU Directive 2000/84/EC);
// America/Chicago is UTC−6 / UTC−5 from the second Sunday of March (US Energy Policy Act of 2005).
describe('labWallTimeToUtc', () => {
  it.each([
    ['2026-12-03', '13:00', 'Europe/Berlin', '2026-12-03T12:00:00.000Z'],
    ['2027-07-01', '13:00', 'Europe/Berlin', '2027-07-01T11:00:00.000Z'],
    ['2027-03-28', '01:30', 'Europe/Berlin', '2027-03-28T00:30:00.000Z'],
    ['2027-03-28', '04:30', 'Europe/Berlin', '2027-03-28T02:30:00.000Z'],
    ['2027-03-14', '09:00', 'America/Chicago', '2027-03-14T14:00:00.000Z'],
  ])('%s %s in %s is %s', (date, time, zone, utc) => {
    expect(labWallTimeToUtc(date, time, zone).toISOString()).toBe(utc);
  });

  it('reads the offset on both sides of the change', () => {
    expect(zoneOffsetMinutes(new Date('2027-03-28T00:59:00Z'), 'Europe/Berlin')).toBe(60);
    expect(zoneOffsetMinutes(new Date('2027-03-28T01:00:00Z'), 'Europe/Berlin')).toBe(120);
  });

  it('adds calendar days across month ends', () => {
    expect(addDays('2026-12-30', 3)).toBe('2027-01-02');
  });
});
