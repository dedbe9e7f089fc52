import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { Loading, Notice, Panel } from '@/components/ui/feedback';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { bookingDetailOptions } from '@/features/bookings/api/bookings.queries';
import { BookingActions } from '@/features/bookings/components/booking-actions';
import { BookingFacts } from '@/features/bookings/components/booking-facts';
import { BookingHistory } from '@/features/bookings/components/booking-history';
import { instrumentTags } from '@/features/bookings/utils/booking-text';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { BookingSetupsPanel } from '@/features/setups/components/booking-setups-panel';

/** /bookings/:id: one booking, what may be done with it now, and its audit trail. */
export function BookingDetailRoute() {
  const id = Number(useParams().id);
  const user = useSignedInUser();
  const detail = useQuery(bookingDetailOptions(id));
  const lab = useQuery(labInfoOptions());

  if (detail.isPending || lab.isPending) return <Loading label="Loading booking…" />;
  if (detail.isError) return <Notice tone="fault">{detail.error.message}</Notice>;
  if (lab.isError) return <Notice tone="fault">{lab.error.message}</Notice>;
  const { booking, events } = detail.data;
  const timeZone = lab.data.timeZone;
  return (
    <div className="space-y-5">
      <div>
        <Link to={user.can('researcher') ? '/bookings' : '/calendar'} className="text-caption font-semibold text-phase-700">
          ← {user.can('researcher') ? 'My bookings' : 'Calendar'}
        </Link>
        <h1 className="mt-1 text-display text-ink-900">
          {booking.kind === 'maintenance' ? 'Maintenance · ' : ''}
          <span className="font-mono">{instrumentTags(booking)}</span>
        </h1>
        <p className="mt-1 text-body text-ink-500">Times are on the lab’s clock ({timeZone}).</p>
      </div>
      <Panel>
        <BookingFacts booking={booking} timeZone={timeZone} full />
      </Panel>
      <BookingActions booking={booking} />
      {booking.kind === 'booking' ? (
        <BookingSetupsPanel bookingId={booking.id} canRecord={user.can('manager') || (user.can('researcher') && booking.owner?.id === user.id)} />
      ) : null}
      <BookingHistory events={events} timeZone={timeZone} />
    </div>
  );
}
