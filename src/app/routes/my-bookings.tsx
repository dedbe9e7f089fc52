import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Loading, Notice } from '@/components/ui/feedback';
import { MyBookingLists, MyWaitlist } from '@/features/bookings/components/my-bookings';
import { CalendarFeedsPanel } from '@/features/feeds/components/calendar-feeds-panel';
import { labInfoOptions } from '@/features/lab/api/lab.queries';

/** /bookings (researchers and managers): my upcoming and past bookings and the slots I wait for. */
export function MyBookingsRoute() {
  const lab = useQuery(labInfoOptions());
  if (lab.isPending) return <Loading label="Loading your bookings…" />;
  if (lab.isError) return <Notice tone="fault">{lab.error.message}</Notice>;
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-display text-ink-900">My bookings</h1>
          <p className="mt-1 text-body text-ink-500">Times are on the lab’s clock ({lab.data.timeZone}).</p>
        </div>
        <Link to="/calendar" className="rounded-chip bg-copper-600 px-3.5 py-2 font-semibold text-white hover:bg-copper-700">
          Book on the calendar
        </Link>
      </div>
      <MyBookingLists timeZone={lab.data.timeZone} />
      <MyWaitlist timeZone={lab.data.timeZone} />
      <CalendarFeedsPanel />
    </div>
  );
}
