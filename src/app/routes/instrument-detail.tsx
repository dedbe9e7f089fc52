import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { Loading, Notice } from '@/components/ui/feedback';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { instrumentDetailOptions } from '@/features/instruments/api/instruments.queries';
import { InstrumentDetails } from '@/features/instruments/components/instrument-details';
import { QualificationsPanel } from '@/features/instruments/components/qualifications-panel';
import { peopleListOptions } from '@/features/people/api/people.queries';
import { PhotoGallery } from '@/features/photos/components/photo-gallery';
import { InstrumentBookings } from '@/features/bookings/components/instrument-bookings';
import { CalendarFeedsPanel } from '@/features/feeds/components/calendar-feeds-panel';
import { labInfoOptions } from '@/features/lab/api/lab.queries';

export function InstrumentDetailRoute() {
  const id = Number(useParams().id);
  const user = useSignedInUser();
  const isManager = user.can('manager');
  const instrument = useQuery(instrumentDetailOptions(id));
  const people = useQuery({ ...peopleListOptions(), enabled: isManager });
  const lab = useQuery(labInfoOptions());

  if (instrument.isPending) return <Loading label="Loading instrument…" />;
  if (instrument.isError) return <Notice tone="fault">{instrument.error.message}</Notice>;
  const i = instrument.data;
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <Link to="/instruments" className="text-caption font-semibold text-phase-700">← Instruments</Link>
          <h1 className="mt-1 text-display text-ink-900">
            <span className="font-mono">{i.tag}</span> <span className="font-semibold text-ink-700">{i.name}</span>
          </h1>
        </div>
        {isManager ? (
          <Link to={`/instruments/${i.id}/edit`} className="rounded-chip bg-white px-3.5 py-2 font-semibold text-ink-800 ring-1 ring-ink-200 hover:bg-ptfe-100">Edit</Link>
        ) : null}
      </div>
      <InstrumentDetails instrument={i} />
      <div className="grid gap-5 lg:grid-cols-2">
        {lab.data ? <InstrumentBookings instrumentId={i.id} timeZone={lab.data.timeZone} /> : <Loading />}
        <CalendarFeedsPanel instrumentId={i.id} />
        <QualificationsPanel instrumentId={i.id} candidates={isManager ? (people.data ?? []) : null} />
        <PhotoGallery subjectType="instrument" subjectId={i.id} canUpload={isManager} currentUserId={user.id} isManager={isManager} />
      </div>
    </div>
  );
}
