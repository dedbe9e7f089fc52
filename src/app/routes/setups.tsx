import { useQuery } from '@tanstack/react-query';
import { Link, useSearchParams } from 'react-router-dom';
import { Loading, Notice } from '@/components/ui/feedback';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { SetupList } from '@/features/setups/components/setup-list';

/** /setups: my setups and everyone's (visitors read everyone's). Which list is shown lives in the URL. */
export function SetupsRoute() {
  const user = useSignedInUser();
  const lab = useQuery(labInfoOptions());
  const [params] = useSearchParams();
  const canRecord = user.can('researcher');
  const show = canRecord && params.get('show') !== 'all' ? 'mine' : 'all';
  if (lab.isPending) return <Loading label="Loading setups…" />;
  if (lab.isError) return <Notice tone="fault">{lab.error.message}</Notice>;

  const tab = (value: 'mine' | 'all', label: string) => (
    <Link
      to={value === 'mine' ? '/setups' : '/setups?show=all'}
      replace
      aria-current={show === value ? 'page' : undefined}
      className={`rounded-chip px-3 py-1.5 font-semibold ${show === value ? 'bg-ink-800 text-white' : 'text-ink-700 hover:bg-ptfe-100'}`}
    >
      {label}
    </Link>
  );
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-display text-ink-900">Setups</h1>
          <p className="mt-1 text-body text-ink-500">How the bench was wired for each booking, revision by revision. Times are on the lab’s clock ({lab.data.timeZone}).</p>
        </div>
        {canRecord ? (
          <Link to="/setups/new" className="rounded-chip bg-copper-600 px-3.5 py-2 font-semibold text-white hover:bg-copper-700">
            Record a setup
          </Link>
        ) : null}
      </div>
      {canRecord ? (
        <nav aria-label="Which setups" className="flex gap-1">
          {tab('mine', 'Mine')}
          {tab('all', 'All')}
        </nav>
      ) : null}
      <SetupList
        filters={show === 'mine' ? { mine: true } : {}}
        timeZone={lab.data.timeZone}
        empty={show === 'mine' ? 'You have not recorded a setup yet: open one of your bookings and record it.' : 'No setup recorded yet.'}
      />
    </div>
  );
}
