import { createPlugin } from '@fullcalendar/core';
import { NamedTimeZoneImpl } from '@fullcalendar/core/internal';
import { instantOfWallClock, wallClockAt } from './lab-time';

/**
 * FullCalendar's named time zones, backed by Intl through lab-time.ts. Without such a plugin FullCalendar
 * cannot compute offsets for `timeZone: 'Europe/Berlin'` and shows UTC clock times; with it, the calendar
 * shows the lab's wall clock in any browser, and select/drop callbacks hand back true instants.
 * (The luxon and moment plugins do the same with a library; Intl is already in every browser.)
 */
class IntlNamedTimeZone extends NamedTimeZoneImpl {
  /** Offset in minutes at the lab wall-clock time `a` ([year, month0, day, hour, minute, second, ms]). */
  offsetForArray(a: number[]): number {
    const wall = Date.UTC(a[0]!, a[1] ?? 0, a[2] ?? 1, a[3] ?? 0, a[4] ?? 0, a[5] ?? 0, a[6] ?? 0);
    return Math.round((wall - instantOfWallClock(wall, this.timeZoneName)) / 60_000);
  }

  /** The lab wall clock at an instant, as FullCalendar's date array. */
  timestampToArray(ms: number): number[] {
    const d = new Date(wallClockAt(ms, this.timeZoneName));
    return [d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate(), d.getUTCHours(), d.getUTCMinutes(), d.getUTCSeconds(), d.getUTCMilliseconds()];
  }
}

export const labTimeZonePlugin = createPlugin({ name: 'skewbench-lab-time-zone', namedTimeZonedImpl: IntlNamedTimeZone });
