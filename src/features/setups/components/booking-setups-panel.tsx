import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Loading, Notice, Panel } from '@/components/ui/feedback';
import { setupListOptions } from '../api/setups.queries';

/** The setups recorded for one booking, and a way to record one for whoever may. */
export function BookingSetupsPanel({ bookingId, canRecord }: { bookingId: number; canRecord: boolean }) {
  const setups = useQuery(setupListOptions({ bookingId }));
  return (
    <Panel title="Setups">
      {setups.isPending ? <Loading label="Loading setups…" /> : null}
      {setups.isError ? <Notice tone="fault">{setups.error.message}</Notice> : null}
      {setups.data?.length === 0 ? <p className="text-body text-ink-500">No setup recorded for this booking yet.</p> : null}
      {setups.data?.length ? (
        <ul className="divide-y divide-ink-100" aria-label="Setups of this booking">
          {setups.data.map((s) => (
            <li key={s.id} className="flex flex-wrap items-baseline justify-between gap-2 py-2">
              <Link to={`/setups/${s.id}`} className="font-semibold text-phase-700 underline-offset-4 hover:underline">
                {s.title}
              </Link>
              <span className="text-caption text-ink-500">
                {s.owner.name} · {s.revisions} {s.revisions === 1 ? 'revision' : 'revisions'}
              </span>
            </li>
          ))}
        </ul>
      ) : null}
      {canRecord ? (
        <Link to={`/setups/new?bookingId=${bookingId}`} className="mt-3 inline-block rounded-chip bg-copper-600 px-3.5 py-2 font-semibold text-white hover:bg-copper-700">
          Record the setup
        </Link>
      ) : null}
    </Panel>
  );
}
