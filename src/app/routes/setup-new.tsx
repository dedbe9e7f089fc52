import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import type { Booking } from '@shared/schemas/bookings';
import type { Instrument } from '@shared/schemas/instruments';
import type { Part } from '@shared/schemas/parts';
import { EmptyState, Loading, Notice, Panel } from '@/components/ui/feedback';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { bookingDetailOptions, myBookingsOptions } from '@/features/bookings/api/bookings.queries';
import { instrumentListOptions } from '@/features/instruments/api/instruments.queries';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { partListOptions } from '@/features/parts/api/parts.queries';
import { useCreateSetup } from '@/features/setups/api/setups.mutations';
import { SetupEditor } from '@/features/setups/components/setup-editor';
import { newDraft } from '@/features/setups/utils/setup-draft';
import { bookingChoices, bookingLabel } from './setup-bookings';
import { SetupAnalysis } from './setup-analysis';

/** Without a booking: choose one of mine to record the setup for. */
function PickBooking({ timeZone }: { timeZone: string }) {
  const mine = useQuery(myBookingsOptions());
  if (mine.isPending) return <Loading label="Loading your bookings…" />;
  if (mine.isError) return <Notice tone="fault">{mine.error.message}</Notice>;
  const choices = bookingChoices(mine.data, timeZone);
  return (
    <Panel title="Which booking is this setup for?">
      {choices.length === 0 ? (
        <EmptyState title="You have no booking to record a setup for">Book the bench on the calendar first.</EmptyState>
      ) : (
        <ul className="divide-y divide-ink-100" aria-label="My bookings">
          {choices.map((c) => (
            <li key={c.id} className="py-2">
              <Link to={`/setups/new?bookingId=${c.id}`} className="font-semibold text-phase-700 underline-offset-4 hover:underline">
                {c.label}
              </Link>
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}

function NewSetupForBooking({ bookingId, timeZone }: { bookingId: number; timeZone: string }) {
  const user = useSignedInUser();
  const booking = useQuery(bookingDetailOptions(bookingId));
  const parts = useQuery(partListOptions());
  const instruments = useQuery(instrumentListOptions());
  if (booking.isPending || parts.isPending || instruments.isPending) return <Loading label="Loading the booking and the inventory…" />;
  const failed = booking.error ?? parts.error ?? instruments.error;
  if (failed) return <Notice tone="fault">{failed.message}</Notice>;
  const b = booking.data!.booking;
  // The server refuses these too; saying so before the form is filled in spares the typing.
  if (b.kind !== 'booking') return <Notice tone="fault">A maintenance block has no setup.</Notice>;
  if (!user.can('manager') && b.owner?.id !== user.id) return <Notice tone="fault">You can record setups only for your own bookings.</Notice>;
  return <NewSetupEditor booking={b} parts={parts.data!} instruments={instruments.data!} timeZone={timeZone} />;
}

/** The editor on a fresh draft prefilled from the booking: its purpose as title, its generator and analyzers. */
function NewSetupEditor({ booking, parts, instruments, timeZone }: { booking: Booking; parts: Part[]; instruments: Instrument[]; timeZone: string }) {
  const navigate = useNavigate();
  const create = useCreateSetup();
  const [initial] = useState(() =>
    newDraft({
      title: booking.purpose ?? '',
      generatorId: booking.instruments.find((i) => i.kind === 'signal-generator')?.id ?? null,
      outputIds: booking.instruments.filter((i) => i.kind === 'spectrum-analyzer' || i.kind === 'oscilloscope').map((i) => i.id),
    }),
  );
  return (
    <>
      <p className="text-body text-ink-600">
        For the booking{' '}
        <Link to={`/bookings/${booking.id}`} className="font-semibold text-phase-700 underline-offset-4 hover:underline">
          {bookingLabel(booking, timeZone)}
        </Link>
      </p>
      <SetupEditor
        initial={initial}
        parts={parts}
        instruments={instruments}
        bookedInstrumentIds={booking.instruments.map((i) => i.id)}
        bookingId={booking.id}
        saving={create.isPending}
        error={create.error}
        submitLabel="Save setup"
        cancelTo={`/bookings/${booking.id}`}
        renderAnalysis={(result) => <SetupAnalysis result={result} />}
        onSave={(document, note) => create.mutate({ bookingId: booking.id, document, note }, { onSuccess: ({ setup }) => navigate(`/setups/${setup.id}`, { state: { done: 'saved' } }) })}
      />
    </>
  );
}

/** /setups/new?bookingId=N (researchers and managers): record how the bench is wired for a booking. */
export function SetupNewRoute() {
  const [params] = useSearchParams();
  const lab = useQuery(labInfoOptions());
  const bookingId = Number(params.get('bookingId'));
  if (lab.isPending) return <Loading />;
  if (lab.isError) return <Notice tone="fault">{lab.error.message}</Notice>;
  return (
    <div className="space-y-5">
      <div>
        <Link to="/setups" className="text-caption font-semibold text-phase-700">
          ← Setups
        </Link>
        <h1 className="mt-1 text-display text-ink-900">Record a setup</h1>
      </div>
      {Number.isInteger(bookingId) && bookingId > 0 ? (
        <NewSetupForBooking key={bookingId} bookingId={bookingId} timeZone={lab.data.timeZone} />
      ) : (
        <PickBooking timeZone={lab.data.timeZone} />
      )}
    </div>
  );
}
