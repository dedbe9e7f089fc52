/** An instant `days` from now at the given UTC hour: booking tests use late evenings, away from the demo's day bookings. */
export function at(days: number, hourUtc: number, minute = 0): string {
  const d = new Date();
  d.setUTCDate(d.getUTCDate() + days);
  d.setUTCHours(hourUtc, minute, 0, 0);
  return d.toISOString();
}
