/**
 * The lab's wall clock ↔ UTC instants, with Intl only (no time-zone library).
 *
 * Skewbench shows every time in the lab's zone, whatever zone the browser is in. A "wall clock" here is a
 * number of milliseconds whose UTC fields read as the lab's local date and time (the way FullCalendar's
 * date markers work), so plain Date.UTC arithmetic applies to it.
 */

const DAY_MS = 86_400_000;
const partFormatters = new Map<string, Intl.DateTimeFormat>();

function partFormatter(timeZone: string): Intl.DateTimeFormat {
  let formatter = partFormatters.get(timeZone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: 'numeric',
      day: 'numeric',
      hour: 'numeric',
      minute: 'numeric',
      second: 'numeric',
    });
    partFormatters.set(timeZone, formatter);
  }
  return formatter;
}

/** The wall clock in `timeZone` at the instant `instantMs`. */
export function wallClockAt(instantMs: number, timeZone: string): number {
  const fields: Record<string, number> = {};
  for (const part of partFormatter(timeZone).formatToParts(new Date(instantMs))) fields[part.type] = Number(part.value);
  const millis = ((instantMs % 1000) + 1000) % 1000;
  return Date.UTC(fields.year!, fields.month! - 1, fields.day!, fields.hour!, fields.minute!, fields.second!, millis);
}

/** Offset of `timeZone` from UTC at an instant, in minutes, east positive (Berlin: 60 in winter, 120 in summer). */
export function offsetMinutesAt(instantMs: number, timeZone: string): number {
  return Math.round((wallClockAt(instantMs, timeZone) - instantMs) / 60_000);
}

/**
 * The instant at which the lab's clock shows `wallMs`. Like Temporal's `compatible` rule: a time that occurs
 * twice (the hour the clocks go back) gives the earlier instant; a time skipped when the clocks go forward
 * is moved forward by the gap (02:30 on the spring change in Berlin is 03:30 summer time).
 */
export function instantOfWallClock(wallMs: number, timeZone: string): number {
  const offsetBefore = offsetMinutesAt(wallMs - DAY_MS, timeZone);
  const offsetAfter = offsetMinutesAt(wallMs + DAY_MS, timeZone);
  const matching = [...new Set([offsetBefore, offsetAfter])]
    .map((offset) => wallMs - offset * 60_000)
    .filter((instant) => wallClockAt(instant, timeZone) === wallMs)
    .sort((a, b) => a - b);
  return matching[0] ?? wallMs - offsetBefore * 60_000;
}

const inputPattern = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/;

/**
 * A `datetime-local` value (`2026-12-03T13:00`), read as the lab's wall clock, as a UTC instant
 * (`2026-12-03T12:00:00.000Z`); null when the value is empty or not a real date and time.
 */
export function labInputToInstant(value: string, timeZone: string): string | null {
  const match = inputPattern.exec(value.trim());
  if (!match) return null;
  const [year, month, day, hour, minute, second = 0] = match.slice(1).map((n) => Number(n ?? 0));
  const wall = Date.UTC(year!, month! - 1, day!, hour!, minute!, second);
  const check = new Date(wall);
  // Date.UTC rolls 31 November over to 1 December; a value that does not come back unchanged was not a date.
  if (check.getUTCMonth() !== month! - 1 || check.getUTCDate() !== day || check.getUTCHours() !== hour) return null;
  return new Date(instantOfWallClock(wall, timeZone)).toISOString();
}

/** A UTC instant as the `datetime-local` value of the lab's wall clock at that instant (`2026-12-03T13:00`). */
export function instantToLabInput(instant: string | Date, timeZone: string): string {
  const ms = typeof instant === 'string' ? Date.parse(instant) : instant.getTime();
  return new Date(wallClockAt(ms, timeZone)).toISOString().slice(0, 16);
}

/** The lab's calendar date (`YYYY-MM-DD`) at an instant. */
export function labDateOf(instant: string | Date, timeZone: string): string {
  return instantToLabInput(instant, timeZone).slice(0, 10);
}

/** Formatting in the lab's zone: the reader's locale for dates, always a 24-hour clock for times. */
function labFormat(timeZone: string, locale: string | undefined, options: Intl.DateTimeFormatOptions) {
  return new Intl.DateTimeFormat(locale, { timeZone, ...options });
}
const timeOptions: Intl.DateTimeFormatOptions = { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' };
const dayOptions: Intl.DateTimeFormatOptions = { weekday: 'short', day: 'numeric', month: 'short' };

/** `13:00` in the lab's zone. */
export function formatLabTime(instant: string, timeZone: string, locale?: string): string {
  return labFormat(timeZone, locale, timeOptions).format(new Date(instant));
}

/** `Thu, 3 Dec 2026, 13:00` in the lab's zone. */
export function formatLabDateTime(instant: string, timeZone: string, locale?: string): string {
  return labFormat(timeZone, locale, { ...dayOptions, year: 'numeric', ...timeOptions }).format(new Date(instant));
}

/** A slot in the lab's zone: `Thu, 3 Dec, 13:00–17:00` on one day, else `Thu, 3 Dec 22:00 – Fri, 4 Dec 06:00`. */
export function formatLabRange(start: string, end: string, timeZone: string, locale?: string): string {
  const day = labFormat(timeZone, locale, dayOptions);
  const startDay = day.format(new Date(start));
  // A slot that ends at midnight still belongs to its day (20:00–00:00).
  const sameDay = Date.parse(end) - Date.parse(start) <= DAY_MS && labDateOf(start, timeZone) === labDateOf(new Date(Date.parse(end) - 1), timeZone);
  if (sameDay) return `${startDay}, ${formatLabTime(start, timeZone, locale)}–${formatLabTime(end, timeZone, locale)}`;
  return `${startDay} ${formatLabTime(start, timeZone, locale)} – ${day.format(new Date(end))} ${formatLabTime(end, timeZone, locale)}`;
}
