import { useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { Link, useLocation, useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { Loading, Notice, Panel } from '@/components/ui/feedback';
import { Button } from '@/components/ui/button';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { myBookingsOptions } from '@/features/bookings/api/bookings.queries';
import { formatLabRange } from '@/features/bookings/utils/lab-time';
import { instrumentListOptions } from '@/features/instruments/api/instruments.queries';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { partListOptions } from '@/features/parts/api/parts.queries';
import { PhotoGallery } from '@/features/photos/components/photo-gallery';
import { setupCsvUrl, setupDetailOptions, setupRevisionOptions, type LoadedSetup } from '@/features/setups/api/setups.queries';
import { CompareRevisions, type RevisionChoice } from '@/features/setups/components/compare-revisions';
import { PartsHeldNotices } from '@/features/setups/components/parts-held-notices';
import { ReloadDialog } from '@/features/setups/components/reload-dialog';
import { RevisionHistory } from '@/features/setups/components/revision-history';
import { SetupFacts } from '@/features/setups/components/setup-facts';
import { WiringTable } from '@/features/setups/components/wiring-table';
import { formatLabInstant } from '@/features/setups/utils/setup-time';
import { bookingChoices } from './setup-bookings';
import { SetupAnalysis } from './setup-analysis';

const linkButton = 'rounded-chip px-3.5 py-2 font-semibold ring-1 ring-inset';
const secondary = `${linkButton} bg-white text-ink-800 ring-ink-200 hover:bg-ptfe-100`;

/** Choose a booking of mine and start a new setup there from the revision shown. */
function ReloadButton({ setup, timeZone }: { setup: LoadedSetup; timeZone: string }) {
  const navigate = useNavigate();
  const [open, setOpen] = useState(false);
  const mine = useQuery({ ...myBookingsOptions(), enabled: open });
  return (
    <>
      <Button variant="secondary" onClick={() => setOpen(true)}>
        Reload into another booking
      </Button>
      {open && mine.isPending ? <Loading label="Loading your bookings…" /> : null}
      {open && mine.isError ? <Notice tone="fault">{mine.error.message}</Notice> : null}
      {open && mine.data ? (
        <ReloadDialog
          setupId={setup.id}
          revision={setup.revision.number}
          bookings={bookingChoices(mine.data, timeZone, setup.bookingId)}
          onClose={() => setOpen(false)}
          onReloaded={(created) => navigate(`/setups/${created.id}`, { state: { done: 'reloaded' } })}
        />
      ) : null}
    </>
  );
}

/** /setups/:id (?revision=n): the wiring, the stored analysis, history and comparison, photos. */
export function SetupDetailRoute() {
  const id = Number(useParams().id);
  const user = useSignedInUser();
  const [params, setParams] = useSearchParams();
  // Set by the page that sent us here after a save or a reload, to confirm it.
  const done = (useLocation().state as { done?: 'saved' | 'reloaded' } | null)?.done;
  const wanted = Number(params.get('revision'));
  const revisionNumber = Number.isInteger(wanted) && wanted > 0 ? wanted : null;
  const latest = useQuery(setupDetailOptions(id));
  const older = useQuery({ ...setupRevisionOptions(id, revisionNumber ?? 0), enabled: revisionNumber !== null });
  const origin = latest.data?.reloadedFrom;
  const originRevision = useQuery({ ...setupRevisionOptions(origin?.setupId ?? 0, origin?.revision ?? 0), enabled: !!origin });
  const parts = useQuery(partListOptions());
  const instruments = useQuery(instrumentListOptions());
  const lab = useQuery(labInfoOptions());
  const partsById = useMemo(() => new Map((parts.data ?? []).map((p) => [p.id, p])), [parts.data]);

  const shown = revisionNumber === null ? latest : older;
  if (shown.isPending || latest.isPending || parts.isPending || instruments.isPending || lab.isPending) return <Loading label="Loading setup…" />;
  const failed = shown.error ?? latest.error ?? parts.error ?? instruments.error ?? lab.error;
  if (failed) return <Notice tone="fault">{failed.message}</Notice>;
  const setup = shown.data!;
  const head = latest.data!;
  const timeZone = lab.data!.timeZone;
  const instrumentTag = (instrumentId: number | null) => instruments.data!.find((i) => i.id === instrumentId)?.tag ?? (instrumentId === null ? '—' : `#${instrumentId}`);
  const isLatest = setup.revision.number === head.revision.number;
  const isManager = user.can('manager');

  const choices: RevisionChoice[] = head.revisions.map((r) => ({ id: r.id, label: `Revision ${r.number}${r.note ? ` — ${r.note}` : ''}` }));
  if (origin && originRevision.data) choices.push({ id: originRevision.data.revision.id, label: `${origin.title}, revision ${origin.revision} (reloaded from)` });
  const from = Number(params.get('from'));
  const to = Number(params.get('to'));
  const pair = from > 0 && to > 0 ? { from, to } : null;

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div className="min-w-0">
          <Link to="/setups" className="text-caption font-semibold text-phase-700">
            ← Setups
          </Link>
          <h1 className="mt-1 text-display text-ink-900">{setup.title}</h1>
          <p className="mt-1 text-body text-ink-600">
            <Link to={`/bookings/${setup.bookingId}`} className="font-semibold text-phase-700 underline-offset-4 hover:underline">
              {formatLabRange(setup.booking.startsAt, setup.booking.endsAt, timeZone)} · {setup.booking.instruments.map((i) => i.tag).join(' · ')}
            </Link>{' '}
            · {setup.owner.name}
          </p>
          <p className="text-body text-ink-500">
            Revision {setup.revision.number} of {head.revisions.length}, saved {formatLabInstant(setup.revision.savedAt, timeZone)} by {setup.revision.savedBy.name}
            {setup.revision.note ? ` — ${setup.revision.note}` : ''}
          </p>
          {setup.reloadedFrom ? (
            <p className="text-body text-ink-500">
              Reloaded from{' '}
              <Link to={`/setups/${setup.reloadedFrom.setupId}?revision=${setup.reloadedFrom.revision}`} className="font-semibold text-phase-700 underline-offset-4 hover:underline">
                {setup.reloadedFrom.title}, revision {setup.reloadedFrom.revision}
              </Link>
            </p>
          ) : null}
        </div>
        <div className="flex flex-wrap gap-2">
          {head.canEdit ? (
            <Link to={`/setups/${id}/edit`} className="rounded-chip bg-copper-600 px-3.5 py-2 font-semibold text-white hover:bg-copper-700">
              Edit
            </Link>
          ) : null}
          {user.can('researcher') ? <ReloadButton setup={setup} timeZone={timeZone} /> : null}
          <Link to={`/setups/${id}/rebuild?revision=${setup.revision.number}`} className={secondary}>
            Rebuild sheet
          </Link>
          <a href={setupCsvUrl(id, setup.revision.number)} download className={secondary}>
            Export CSV
          </a>
        </div>
      </div>
      {done === 'saved' && isLatest ? <Notice tone="pass">Saved as revision {head.revision.number}.</Notice> : null}
      {done === 'reloaded' && isLatest ? <Notice tone="pass">A new setup for this booking, from {head.reloadedFrom?.title}. Edit it to record what changed on the bench.</Notice> : null}
      {!isLatest ? (
        <Notice>
          This is revision {setup.revision.number}; the setup has changed since.{' '}
          <Link to={`/setups/${id}`} className="font-semibold underline underline-offset-4">
            See the latest
          </Link>
        </Notice>
      ) : null}
      <PartsHeldNotices partsHeld={setup.partsHeld} />
      <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_30rem]">
        <div className="min-w-0 space-y-5">
          <Panel title="Wiring">
            <WiringTable document={setup.document} analysis={setup.analysis} partsById={partsById} instrumentTag={instrumentTag} />
          </Panel>
          <Panel title="Settings">
            <SetupFacts document={setup.document} instrumentTag={instrumentTag} />
          </Panel>
        </div>
        <Panel title="Analysis" className="min-w-0 self-start">
          <p className="mb-3 text-caption text-ink-500">Computed by the server when this revision was saved.</p>
          <SetupAnalysis result={setup.analysis} />
        </Panel>
      </div>
      <div className="grid gap-5 lg:grid-cols-[20rem_minmax(0,1fr)]">
        <RevisionHistory setupId={id} revisions={head.revisions} shown={setup.revision.number} timeZone={timeZone} />
        <CompareRevisions
          key={choices.length}
          choices={choices}
          pair={pair}
          instrumentTag={instrumentTag}
          onCompare={(next) =>
            setParams((prev) => {
              const p = new URLSearchParams(prev);
              p.set('from', String(next.from));
              p.set('to', String(next.to));
              return p;
            }, { replace: true })
          }
        />
      </div>
      <PhotoGallery subjectType="setup" subjectId={id} canUpload={head.canEdit} currentUserId={user.id} isManager={isManager} />
    </div>
  );
}
