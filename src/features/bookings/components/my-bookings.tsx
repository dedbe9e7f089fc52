import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { Booking, WaitlistEntry } from '@shared/schemas/bookings';
import { Badge, EmptyState, Loading, Notice, Panel } from '@/components/ui/feedback';
import { Button } from '@/components/ui/button';
import { useLeaveWaitlist } from '../api/bookings.mutations';
import { myBookingsOptions, myWaitlistOptions } from '../api/bookings.queries';
import { instrumentTags } from '../utils/booking-text';
import { formatLabRange } from '../utils/lab-time';
import { BookingStatusBadge } from './booking-facts';

function BookingList({ title, bookings, timeZone, empty }: { title: string; bookings: Booking[]; timeZone: string; empty: string }) {
  return (
    <Panel title={title}>
      {bookings.length === 0 ? (
        <EmptyState title={empty} />
      ) : (
        <ul className="divide-y divide-ink-100" aria-label={title}>
          {bookings.map((b) => (
            <li key={b.id} className="flex flex-wrap items-center justify-between gap-x-4 gap-y-1 py-2">
              <div className="min-w-0">
                <Link to={`/bookings/${b.id}`} className="font-mono font-semibold text-phase-700 underline-offset-4 hover:underline">
                  {instrumentTags(b)}
                </Link>
                <div className="text-caption text-ink-500">
                  {formatLabRange(b.startsAt, b.endsAt, timeZone)}
                  {b.purpose ? ` · ${b.purpose}` : ''}
                </div>
              </div>
              <BookingStatusBadge booking={b} />
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}

/** The signed-in person's upcoming and past bookings, each linking to its page. */
export function MyBookingLists({ timeZone }: { timeZone: string }) {
  const mine = useQuery(myBookingsOptions());
  if (mine.isPending) return <Loading label="Loading your bookings…" />;
  if (mine.isError) return <Notice tone="fault">{mine.error.message}</Notice>;
  return (
    <div className="grid gap-5 lg:grid-cols-2">
      <BookingList title="Upcoming" bookings={mine.data.upcoming} timeZone={timeZone} empty="No upcoming bookings" />
      <BookingList title="Past" bookings={mine.data.past} timeZone={timeZone} empty="No past bookings yet" />
    </div>
  );
}

const waitlistLabels: Record<WaitlistEntry['status'], { text: string; tone: 'info' | 'pass' | 'muted' }> = {
  waiting: { text: 'Waiting', tone: 'info' },
  offered: { text: 'Offered', tone: 'pass' },
  withdrawn: { text: 'Withdrawn', tone: 'muted' },
  fulfilled: { text: 'Booked', tone: 'muted' },
};

/** Slots the person waits for; an offered one links to the claim page, which books it if it is still free. */
export function MyWaitlist({ timeZone }: { timeZone: string }) {
  const entries = useQuery(myWaitlistOptions());
  const leave = useLeaveWaitlist();
  return (
    <Panel title="Waitlist">
      {entries.isPending ? <Loading /> : entries.isError ? <Notice tone="fault">{entries.error.message}</Notice> : null}
      {leave.error ? <Notice tone="fault">{leave.error.message}</Notice> : null}
      {entries.data && entries.data.length === 0 ? (
        <EmptyState title="You are not waiting for any slot">When a slot you want is taken, the booking form offers to put you on its waitlist.</EmptyState>
      ) : null}
      {entries.data && entries.data.length > 0 ? (
        <ul className="divide-y divide-ink-100" aria-label="Waitlist entries">
          {entries.data.map((entry) => {
            const label = waitlistLabels[entry.status];
            const open = entry.status === 'waiting' || entry.status === 'offered';
            return (
              <li key={entry.id} className="flex flex-wrap items-center justify-between gap-x-4 gap-y-1 py-2">
                <div className="min-w-0">
                  <span className="font-mono font-semibold text-ink-800">{entry.instrument.tag}</span>{' '}
                  <span className="text-body text-ink-600">{formatLabRange(entry.startsAt, entry.endsAt, timeZone)}</span>
                  {entry.note ? <div className="text-caption text-ink-500">{entry.note}</div> : null}
                  {entry.status === 'offered' ? (
                    <div>
                      <Link to={`/waitlist/${entry.id}/claim`} className="text-body font-semibold text-pass-700 underline underline-offset-4">
                        The slot is free — book it
                      </Link>
                    </div>
                  ) : null}
                </div>
                <div className="flex items-center gap-2">
                  <Badge tone={label.tone}>{label.text}</Badge>
                  {open ? (
                    <Button variant="quiet" className="!py-1" disabled={leave.isPending} onClick={() => leave.mutate(entry.id)}>
                      Leave<span className="sr-only"> the waitlist for {entry.instrument.tag}</span>
                    </Button>
                  ) : null}
                </div>
              </li>
            );
          })}
        </ul>
      ) : null}
    </Panel>
  );
}
