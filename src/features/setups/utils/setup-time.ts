const formatters = new Map<string, Intl.DateTimeFormat>();

/** An instant on the lab's clock, e.g. `12 Dec 2026, 14:05`: setups are read against bookings, which use that clock. */
export function formatLabInstant(iso: string, timeZone: string): string {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat(undefined, { timeZone, dateStyle: 'medium', timeStyle: 'short', hourCycle: 'h23' });
    formatters.set(timeZone, f);
  }
  return f.format(new Date(iso));
}
