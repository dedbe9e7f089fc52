import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { bookingStatusLabels } from '@shared/schemas/bookings';
import { Badge, EmptyState, Loading, Notice, Panel } from '@/components/ui/feedback';
import { bookingListOptions } from '../api/bookings.queries';
import { formatLabRange } from '../utils/lab-time';

const DAYS_AHEAD = 14;

/** The next two weeks of bookings and maintenance blocks of one instrument, on the lab's clock. */
export function InstrumentBookings({ instrumentId, timeZone }: { instrumentId: number; timeZone: string }) {
  // The window is fixed when the panel opens, so the query key stays stable while it is shown.
  const [range] = useState(() => {
    const from = new Date();
    return { from: from.toISOString(), to: new Date(from.getTime() + DAYS_AHEAD * 86_400_000).toISOString() };
  });
  const bookings = useQuery(bookingListOptions({ ...range, instrumentIds: [instrumentId] }));
  return (
    <Panel title="Next bookings">
      {bookings.isPending ? <Loading /> : null}
      {bookings.isError ? <Notice tone="fault">{bookings.error.message}</Notice> : null}
      {bookings.data && bookings.data.length === 0 ? <EmptyState title={`Free for the next ${DAYS_AHEAD} days`} /> : null}
      {bookings.data && bookings.data.length > 0 ? (
        <ul className="divide-y divide-ink-100" aria-label="Next bookings">
          {bookings.data.map((b) => (
            <li key={b.id} className="flex flex-wrap items-baseline justify-between gap-2 py-2">
              <div>
                <Link to={`/bookings/${b.id}`} className="font-semibold text-phase-700 hover:underline">
                  {formatLabRange(b.startsAt, b.endsAt, timeZone)}
                </Link>
                <div className="text-caption text-ink-500">
                  {b.kind === 'maintenance' ? 'Maintenance' : b.owner ? `${b.owner.name}${b.purpose ? ` · ${b.purpose}` : ''}` : 'Booked'}
                </div>
              </div>
              <Badge tone={b.kind === 'maintenance' ? 'muted' : b.status === 'checked-in' ? 'pass' : 'info'}>
                {b.kind === 'maintenance' ? 'Maintenance' : bookingStatusLabels[b.status]}
              </Badge>
            </li>
          ))}
        </ul>
      ) : null}
      <Link to={`/calendar?instruments=${instrumentId}`} className="mt-3 inline-block text-caption font-semibold text-phase-700 hover:underline">
        Open in the calendar →
      </Link>
    </Panel>
  );
}
