import { z } from 'zod';
import { clashSchema, ruleIssueSchema, type Booking, type Clash, type RuleIssue } from '@shared/schemas/bookings';
import { ApiError } from '@/lib/api-client';
import { formatLabRange } from './lab-time';

/** `Tobiah Renwick` → `Tobiah R.`: enough to tell bookers apart on a crowded calendar. */
export function shortName(name: string): string {
  const [first, ...rest] = name.trim().split(/\s+/);
  const last = rest.at(-1);
  return last ? `${first} ${last[0]}.` : (first ?? '');
}

/** `PS-1 · SG-1`, the instruments of a booking by tag. */
export const instrumentTags = (booking: Pick<Booking, 'instruments'>) => booking.instruments.map((i) => i.tag).join(' · ');

/** The calendar title: tags and booker (`PS-1 · SG-1 — Tobiah R.`), just tags when the role may not see who, `Maintenance` for blocks. */
export function calendarTitle(booking: Booking): string {
  if (booking.kind === 'maintenance') return 'Maintenance';
  return booking.owner ? `${instrumentTags(booking)} — ${shortName(booking.owner.name)}` : instrumentTags(booking);
}

/** `PS-1 is booked Thu 3 Dec, 13:00–17:00 by Tobiah Renwick` (the name only where the role may see it). */
export function clashText(clash: Clash, timeZone: string): string {
  const when = formatLabRange(clash.startsAt, clash.endsAt, timeZone);
  if (clash.kind === 'maintenance') return `${clash.tag} is blocked for maintenance ${when}`;
  return `${clash.tag} is booked ${when}${clash.owner ? ` by ${clash.owner}` : ''}`;
}

const clashDetailsSchema = z.object({ clashes: z.array(clashSchema) });
const ruleDetailsSchema = z.object({ issues: z.array(ruleIssueSchema) });

/** What a refused booking request ran into: clashing slots (409) and broken rules (422), from the error's details. */
export interface BookingRefusal {
  message: string;
  clashes: Clash[];
  issues: RuleIssue[];
}

export function bookingRefusal(error: unknown): BookingRefusal | null {
  if (!(error instanceof ApiError)) return null;
  if (error.code === 'booking_clash') {
    const details = clashDetailsSchema.safeParse(error.details);
    return { message: error.message, clashes: details.success ? details.data.clashes : [], issues: [] };
  }
  if (error.code === 'booking_rule') {
    const details = ruleDetailsSchema.safeParse(error.details);
    return { message: error.message, clashes: [], issues: details.success ? details.data.issues : [] };
  }
  return null;
}

/** One line per clash or broken rule, else the server's message: for places with room for text only. */
export function refusalLines(error: unknown, timeZone: string): string[] {
  const refusal = bookingRefusal(error);
  if (!refusal) return [error instanceof Error ? error.message : 'The change was not saved.'];
  const lines = [...refusal.clashes.map((c) => clashText(c, timeZone)), ...refusal.issues.map((i) => i.message)];
  return lines.length ? lines : [refusal.message];
}

const claimDetailsSchema = z.object({
  entryStatus: z.string().optional(),
  offered: z.object({ startsAt: z.string(), endsAt: z.string() }).optional(),
});

/**
 * What a refused waitlist claim says about the offer, from the error's details: what became of the entry
 * (`waiting` again after a clash or a broken rule, `fulfilled` when it was already claimed …) and the freed
 * range that had been offered.
 */
export function claimRefusal(error: unknown): { entryStatus: string | null; offered: { startsAt: string; endsAt: string } | null } {
  const details = error instanceof ApiError ? claimDetailsSchema.safeParse(error.details) : null;
  return { entryStatus: details?.success ? (details.data.entryStatus ?? null) : null, offered: details?.success ? (details.data.offered ?? null) : null };
}
