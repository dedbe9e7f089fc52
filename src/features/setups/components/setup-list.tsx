import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { EmptyState, Loading, Notice } from '@/components/ui/feedback';
import { setupListOptions, type SetupListFilters } from '../api/setups.queries';
import { formatLabInstant } from '../utils/setup-time';

/** Setups, most recently changed first, each linking to its page and its booking. */
export function SetupList({ filters, timeZone, empty }: { filters: SetupListFilters; timeZone: string; empty: string }) {
  const setups = useQuery(setupListOptions(filters));
  if (setups.isPending) return <Loading label="Loading setups…" />;
  if (setups.isError) return <Notice tone="fault">{setups.error.message}</Notice>;
  if (setups.data.length === 0) return <EmptyState title={empty} />;
  const cell = 'px-3 py-2 align-top';
  return (
    <div className="overflow-x-auto rounded-panel bg-white shadow-panel ring-1 ring-ink-100">
      <table className="w-full text-left text-body">
        <caption className="sr-only">Setups</caption>
        <thead className="bg-ptfe-50">
          <tr className="text-caption font-semibold uppercase tracking-wide text-ink-500">
            <th scope="col" className={cell}>Setup</th>
            <th scope="col" className={cell}>Owner</th>
            <th scope="col" className={cell}>Booking starts</th>
            <th scope="col" className={`${cell} text-right`}>Revisions</th>
            <th scope="col" className={cell}>Last saved</th>
          </tr>
        </thead>
        <tbody>
          {setups.data.map((s) => (
            <tr key={s.id} className="border-t border-ink-100 hover:bg-ptfe-50">
              <td className={cell}>
                <Link to={`/setups/${s.id}`} className="font-semibold text-phase-700 underline-offset-4 hover:underline">
                  {s.title}
                </Link>
              </td>
              <td className={cell}>{s.owner.name}</td>
              <td className={cell}>
                <Link to={`/bookings/${s.bookingId}`} className="text-phase-700 underline-offset-4 hover:underline">
                  {formatLabInstant(s.bookingStartsAt, timeZone)}
                </Link>
              </td>
              <td className={`${cell} text-right tabular-nums`}>{s.revisions}</td>
              <td className={cell}>{formatLabInstant(s.updatedAt, timeZone)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
