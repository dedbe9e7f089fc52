import { useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Loading, Notice, Panel } from '@/components/ui/feedback';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { formatLabRange } from '@/features/bookings/utils/lab-time';
import { instrumentListOptions } from '@/features/instruments/api/instruments.queries';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { partListOptions } from '@/features/parts/api/parts.queries';
import { PhotoGallery } from '@/features/photos/components/photo-gallery';
import { setupDetailOptions, setupRevisionOptions } from '@/features/setups/api/setups.queries';
import { POWER_CAUTION } from '@/features/setups/components/input-limits-section';
import { SetupFacts } from '@/features/setups/components/setup-facts';
import { WiringTable } from '@/features/setups/components/wiring-table';
import { formatLabInstant } from '@/features/setups/utils/setup-time';
import { SetupAnalysis } from './setup-analysis';

/**
 * /setups/:id/rebuild?revision=n: a sheet to rebuild the bench from, on screen or on paper. Every path's parts in
 * order with a box to tick, the settings, the photos and the computed results; the app header and the buttons
 * stay off the printout.
 */
export function SetupRebuildRoute() {
  const id = Number(useParams().id);
  const user = useSignedInUser();
  const [params] = useSearchParams();
  const wanted = Number(params.get('revision'));
  const number = Number.isInteger(wanted) && wanted > 0 ? wanted : null;
  const latest = useQuery({ ...setupDetailOptions(id), enabled: number === null });
  const older = useQuery({ ...setupRevisionOptions(id, number ?? 0), enabled: number !== null });
  const parts = useQuery(partListOptions());
  const instruments = useQuery(instrumentListOptions());
  const lab = useQuery(labInfoOptions());
  const partsById = useMemo(() => new Map((parts.data ?? []).map((p) => [p.id, p])), [parts.data]);
  const shown = number === null ? latest : older;

  if (shown.isPending || parts.isPending || instruments.isPending || lab.isPending) return <Loading label="Loading the rebuild sheet…" />;
  const failed = shown.error ?? parts.error ?? instruments.error ?? lab.error;
  if (failed) return <Notice tone="fault">{failed.message}</Notice>;
  const setup = shown.data!;
  const timeZone = lab.data!.timeZone;
  const instrumentTag = (instrumentId: number | null) => instruments.data!.find((i) => i.id === instrumentId)?.tag ?? (instrumentId === null ? '—' : `#${instrumentId}`);

  return (
    <article className="space-y-5 print:space-y-4 print:text-[11pt]" aria-label="Rebuild sheet">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <Link to={`/setups/${id}${number ? `?revision=${number}` : ''}`} className="text-caption font-semibold text-phase-700 print:hidden">
            ← Back to the setup
          </Link>
          <p className="text-caption font-semibold uppercase tracking-wide text-ink-500">Rebuild sheet</p>
          <h1 className="text-display text-ink-900">{setup.title}</h1>
          <p className="text-body text-ink-600">
            Revision {setup.revision.number}, saved {formatLabInstant(setup.revision.savedAt, timeZone)} by {setup.revision.savedBy.name} · {setup.owner.name} ·{' '}
            {formatLabRange(setup.booking.startsAt, setup.booking.endsAt, timeZone)} · {setup.booking.instruments.map((i) => i.tag).join(' · ')}
          </p>
        </div>
        <Button className="print:hidden" onClick={() => window.print()}>
          Print
        </Button>
      </div>
      <Notice tone="caution">{POWER_CAUTION} Connect the sources with their RF output off and the level at minimum.</Notice>
      <Panel title="Wiring, in order from each generator to the chip input" className="print:shadow-none print:ring-0 print:p-0">
        <WiringTable document={setup.document} analysis={setup.analysis} partsById={partsById} instrumentTag={instrumentTag} checklist />
      </Panel>
      <Panel title="Settings" className="break-inside-avoid print:shadow-none print:ring-0 print:p-0">
        <SetupFacts document={setup.document} instrumentTag={instrumentTag} />
      </Panel>
      <Panel title="What the wiring emulates" className="break-inside-avoid print:shadow-none print:ring-0 print:p-0">
        <SetupAnalysis result={setup.analysis} />
      </Panel>
      <PhotoGallery subjectType="setup" subjectId={id} canUpload={false} currentUserId={user.id} isManager={false} />
    </article>
  );
}
