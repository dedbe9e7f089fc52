import { describe, expect, it } from 'vitest';
import {
  formatLabRange,
  instantOfWallClock,
  instantToLabInput,
  labDateOf,
  labInputToInstant,
  offsetMinutesAt,
  wallClockAt,
} from '../../src/features/bookings/utils/lab-time.js';

const berlin = 'Europe/Berlin';

describe('lab time: datetime-local values in the lab zone ↔ UTC instants', () => {
  it.each([
    // [wall clock in the zone, zone, UTC instant]; offsets from the IANA tz database (from memory).
    ['2026-12-03T13:00', berlin, '2026-12-03T12:00:00.000Z'], // CET, UTC+1
    ['2026-07-02T13:00', berlin, '2026-07-02T11:00:00.000Z'], // CEST, UTC+2
    ['2026-12-03T13:00', 'America/New_York', '2026-12-03T18:00:00.000Z'], // EST, UTC−5
    ['2026-12-03T13:00', 'Asia/Kolkata', '2026-12-03T07:30:00.000Z'], // IST, UTC+5:30
    ['2026-12-03T13:00', 'UTC', '2026-12-03T13:00:00.000Z'],
    ['2026-12-31T23:30', berlin, '2026-12-31T22:30:00.000Z'],
    ['2027-01-01T00:15', berlin, '2026-12-31T23:15:00.000Z'],
  ])('%s in %s is %s, and back', (wall, zone, instant) => {
    expect(labInputToInstant(wall, zone)).toBe(instant);
    expect(instantToLabInput(instant, zone)).toBe(wall);
  });

  it('refuses empty and impossible values', () => {
    expect(labInputToInstant('', berlin)).toBeNull();
    expect(labInputToInstant('2026-11-31T10:00', berlin)).toBeNull();
    expect(labInputToInstant('2026-12-03T25:00', berlin)).toBeNull();
    expect(labInputToInstant('3 Dec 2026 13:00', berlin)).toBeNull();
  });

  it('accepts seconds in the value', () => {
    expect(labInputToInstant('2026-12-03T13:00:30', berlin)).toBe('2026-12-03T12:00:30.000Z');
  });
});

describe('lab time across the daylight-saving changes in Berlin (2026: 29 March and 25 October)', () => {
  it('spring forward: 01:59 is winter time, 03:00 is summer time, and the skipped 02:30 moves forward to 03:30', () => {
    expect(labInputToInstant('2026-03-29T01:59', berlin)).toBe('2026-03-29T00:59:00.000Z');
    expect(labInputToInstant('2026-03-29T03:00', berlin)).toBe('2026-03-29T01:00:00.000Z');
    expect(labInputToInstant('2026-03-29T02:30', berlin)).toBe('2026-03-29T01:30:00.000Z');
    expect(instantToLabInput('2026-03-29T01:30:00.000Z', berlin)).toBe('2026-03-29T03:30');
  });

  it('fall back: 02:30 happens twice; the value means the first (summer time), and both instants read 02:30', () => {
    expect(labInputToInstant('2026-10-25T02:30', berlin)).toBe('2026-10-25T00:30:00.000Z');
    expect(instantToLabInput('2026-10-25T00:30:00.000Z', berlin)).toBe('2026-10-25T02:30');
    expect(instantToLabInput('2026-10-25T01:30:00.000Z', berlin)).toBe('2026-10-25T02:30');
    expect(labInputToInstant('2026-10-25T03:00', berlin)).toBe('2026-10-25T02:00:00.000Z');
  });

  it('a night booking 22:00–06:00 over the spring change lasts 7 hours, over the autumn change 9', () => {
    const hours = (from: string, to: string) => (Date.parse(labInputToInstant(to, berlin)!) - Date.parse(labInputToInstant(from, berlin)!)) / 3_600_000;
    expect(hours('2026-03-28T22:00', '2026-03-29T06:00')).toBe(7);
    expect(hours('2026-10-24T22:00', '2026-10-25T06:00')).toBe(9);
  });

  it('offsets and wall clocks on either side of the change (the numbers FullCalendar asks for)', () => {
    expect(offsetMinutesAt(Date.parse('2026-03-29T00:59:00Z'), berlin)).toBe(60);
    expect(offsetMinutesAt(Date.parse('2026-03-29T01:00:00Z'), berlin)).toBe(120);
    expect(new Date(wallClockAt(Date.parse('2026-03-29T01:00:00Z'), berlin)).toISOString()).toBe('2026-03-29T03:00:00.000Z');
    expect(new Date(instantOfWallClock(Date.UTC(2026, 9, 25, 12), berlin)).toISOString()).toBe('2026-10-25T11:00:00.000Z');
  });
});

describe('lab dates and readable slots', () => {
  it('the lab date of an instant is the lab’s, not UTC’s', () => {
    expect(labDateOf('2026-12-03T23:30:00Z', berlin)).toBe('2026-12-04');
    expect(labDateOf('2026-12-03T23:30:00Z', 'America/New_York')).toBe('2026-12-03');
  });

  it('formats a slot on one day, one ending at midnight, and one over two days, with a 24-hour clock', () => {
    expect(formatLabRange('2026-12-03T12:00:00Z', '2026-12-03T16:00:00Z', berlin, 'en-GB')).toBe('Thu 3 Dec, 13:00–17:00');
    expect(formatLabRange('2026-12-03T19:00:00Z', '2026-12-03T23:00:00Z', berlin, 'en-GB')).toBe('Thu 3 Dec, 20:00–00:00');
    expect(formatLabRange('2026-12-03T21:00:00Z', '2026-12-04T05:00:00Z', berlin, 'en-GB')).toBe('Thu 3 Dec 22:00 – Fri 4 Dec 06:00');
  });
});
