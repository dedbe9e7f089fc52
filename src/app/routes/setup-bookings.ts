import type { Booking } from '@shared/schemas/bookings';
import { instrumentTags } from '@/features/bookings/utils/booking-text';
import { formatLabRange } from '@/features/bookings/utils/lab-time';
import type { BookingChoice } from '@/features/setups/components/reload-dialog';

/** A booking in one line for the setup pages: when (lab clock), which instruments, what for. */
export function bookingLabel(booking: Booking, timeZone: string): string {
  return `${formatLabRange(booking.startsAt, booking.endsAt, timeZone)} · ${instrumentTags(booking)}${booking.purpose ? ` · ${booking.purpose}` : ''}`;
}

/** The person's bookings a setup can belong to: real bookings that were not cancelled or missed, upcoming first. */
export function bookingChoices(mine: { upcoming: Booking[]; past: Booking[] }, timeZone: string, except?: number): BookingChoice[] {
  return [...mine.upcoming, ...mine.past]
    .filter((b) => b.kind === 'booking' && b.status !== 'cancelled' && b.status !== 'no-show' && b.id !== except)
    .map((b) => ({ id: b.id, label: bookingLabel(b, timeZone) }));
}
