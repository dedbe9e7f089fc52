import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import type { Instrument } from '@shared/schemas/instruments';
import type { Part } from '@shared/schemas/parts';
import { Loading, Notice } from '@/components/ui/feedback';
import { instrumentListOptions } from '@/features/instruments/api/instruments.queries';
import { partListOptions } from '@/features/parts/api/parts.queries';
import { useSaveRevision } from '@/features/setups/api/setups.mutations';
import { setupDetailOptions, type LoadedSetup } from '@/features/setups/api/setups.queries';
import { SetupEditor } from '@/features/setups/components/setup-editor';
import { draftFromDocument } from '@/features/setups/utils/setup-draft';
import { SetupAnalysis } from './setup-analysis';

function EditLatest({ setup, parts, instruments }: { setup: LoadedSetup; parts: Part[]; instruments: Instrument[] }) {
  const navigate = useNavigate();
  const save = useSaveRevision(setup.id);
  // The draft starts from the latest revision once; refetches of the setup must not reset what is being typed.
  const [initial] = useState(() => draftFromDocument(setup.document));
  return (
    <SetupEditor
      initial={initial}
      parts={parts}
      instruments={instruments}
      bookedInstrumentIds={setup.booking.instruments.map((i) => i.id)}
      bookingId={setup.bookingId}
      setupId={setup.id}
      saving={save.isPending}
      error={save.error}
      submitLabel="Save as a new revision"
      cancelTo={`/setups/${setup.id}`}
      renderAnalysis={(result) => <SetupAnalysis result={result} />}
      onSave={(document, note) => save.mutate({ document, note }, { onSuccess: () => navigate(`/setups/${setup.id}`, { state: { done: 'saved' } }) })}
    />
  );
}

/** /setups/:id/edit: change the setup; saving adds a revision and keeps every earlier one. */
export function SetupEditRoute() {
  const id = Number(useParams().id);
  const setup = useQuery(setupDetailOptions(id));
  const parts = useQuery(partListOptions());
  const instruments = useQuery(instrumentListOptions());
  if (setup.isPending || parts.isPending || instruments.isPending) return <Loading label="Loading setup…" />;
  const failed = setup.error ?? parts.error ?? instruments.error;
  if (failed) return <Notice tone="fault">{failed.message}</Notice>;
  const s = setup.data!;
  return (
    <div className="space-y-5">
      <div>
        <Link to={`/setups/${id}`} className="text-caption font-semibold text-phase-700">
          ← {s.title}
        </Link>
        <h1 className="mt-1 text-display text-ink-900">Edit setup</h1>
        <p className="mt-1 text-body text-ink-500">Starts from revision {s.revision.number}. Saving adds revision {s.revision.number + 1}; earlier revisions stay as they are.</p>
      </div>
      {s.canEdit ? (
        <EditLatest setup={s} parts={parts.data!} instruments={instruments.data!} />
      ) : (
        <Notice tone="fault">Only the person who booked the bench or a lab manager may change this setup.</Notice>
      )}
    </div>
  );
}
