/** Days before the due date from which a calibration counts as "due soon". */
export const CALIBRATION_WARNING_DAYS = 30;

export type CalibrationState = 'none' | 'ok' | 'due-soon' | 'overdue';

/** Whole days from `today` to `dueOn` (both `YYYY-MM-DD`); negative when overdue. */
export function daysUntil(dueOn: string, today: string): number {
  return Math.round((Date.parse(`${dueOn}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000);
}

/**
 * Calibration state on the lab's `today`: overdue once the due date has passed, due soon within
 * 30 days (inclusive of the due date itself), none without a due date.
 */
export function calibrationState(dueOn: string | null, today: string): { state: CalibrationState; daysLeft: number | null } {
  if (!dueOn) return { state: 'none', daysLeft: null };
  const daysLeft = daysUntil(dueOn, today);
  const state = daysLeft < 0 ? 'overdue' : daysLeft <= CALIBRATION_WARNING_DAYS ? 'due-soon' : 'ok';
  return { state, daysLeft };
}

/** The calendar date (`YYYY-MM-DD`) of an instant in an IANA time zone. */
export function dateInZone(instant: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(instant);
}
