import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { CHECK_IN_EARLY_MINUTES, cancelInputSchema, checkOutInputSchema, type Booking } from '@shared/schemas/bookings';
import { Button } from '@/components/ui/button';
import { Notice, Panel } from '@/components/ui/feedback';
import { TextAreaField, TextField } from '@/components/ui/field';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { useCancelBooking, useCheckIn, useCheckOut } from '../api/bookings.mutations';

function CheckOutForm({ booking, onDone }: { booking: Booking; onDone: () => void }) {
  const checkOut = useCheckOut();
  const { register, handleSubmit, formState, setError } = useForm({
    resolver: zodResolver(checkOutInputSchema),
    defaultValues: { handoverNote: '', leftConnected: '' },
  });
  const submit = handleSubmit((input) =>
    checkOut.mutate(
      { id: booking.id, input: { handoverNote: input.handoverNote, leftConnected: input.leftConnected || undefined } },
      { onSuccess: onDone, onError: (error) => applyServerFieldErrors(error, setError, ['handoverNote', 'leftConnected']) },
    ),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Check out" className="space-y-3 rounded-chip bg-ptfe-100 p-4">
      {checkOut.error && !formState.errors.handoverNote ? <Notice tone="fault">{checkOut.error.message}</Notice> : null}
      <TextAreaField
        label="Handover note"
        hint="For the next user: the state of the bench, anything unusual, what needs attention."
        error={formState.errors.handoverNote?.message}
        {...register('handoverNote')}
      />
      <TextAreaField
        label="Left connected"
        hint="Cables, pads, attenuators and probes still on the bench, or the setup record that describes them."
        error={formState.errors.leftConnected?.message}
        {...register('leftConnected')}
      />
      <p className="text-caption text-caution-700">Before you leave: RF outputs off, supplies off or at a safe level, probes lifted.</p>
      <Button type="submit" disabled={checkOut.isPending}>
        {checkOut.isPending ? 'Checking out…' : 'Check out'}
      </Button>
    </form>
  );
}

function CancelForm({ booking, onDone }: { booking: Booking; onDone: () => void }) {
  const cancel = useCancelBooking();
  const { register, handleSubmit, formState, setError } = useForm({ resolver: zodResolver(cancelInputSchema), defaultValues: { reason: '' } });
  const submit = handleSubmit(({ reason }) =>
    cancel.mutate({ id: booking.id, reason }, { onSuccess: onDone, onError: (error) => applyServerFieldErrors(error, setError, ['reason']) }),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Cancel the booking" className="space-y-3 rounded-chip bg-ptfe-100 p-4">
      {cancel.error && !formState.errors.reason ? <Notice tone="fault">{cancel.error.message}</Notice> : null}
      <TextField label="Reason" placeholder="Chip not back from the fab" error={formState.errors.reason?.message} {...register('reason')} />
      <p className="text-caption text-ink-500">The slot is freed at once; whoever waits for it is offered it.</p>
      <Button type="submit" variant="danger" disabled={cancel.isPending}>
        {cancel.isPending ? 'Cancelling…' : 'Cancel the booking'}
      </Button>
    </form>
  );
}

/**
 * Check in, check out (with the hand-over) and cancel, where the booking's status allows and the caller may.
 * The server decides the timing (check-in opens shortly before the start) and its refusal is shown as it says.
 */
export function BookingActions({ booking }: { booking: Booking }) {
  const checkIn = useCheckIn();
  const [open, setOpen] = useState<'check-out' | 'cancel' | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const confirmed = booking.status === 'confirmed';
  const checkedIn = booking.status === 'checked-in';
  // After checking out or cancelling nothing is left to do, but the confirmation stays in view.
  if (!booking.canChange || (!confirmed && !checkedIn)) return done ? <Notice tone="pass">{done}</Notice> : null;
  const isBooking = booking.kind === 'booking';

  return (
    <Panel title="At the bench">
      <div className="space-y-3">
        {done ? <Notice tone="pass">{done}</Notice> : null}
        {checkIn.error ? <Notice tone="fault">{checkIn.error.message}</Notice> : null}
        <div className="flex flex-wrap gap-2">
          {confirmed && isBooking ? (
            <Button
              disabled={checkIn.isPending}
              onClick={() => {
                setDone(null);
                checkIn.mutate(booking.id, { onSuccess: () => setDone('Checked in. Check out when you leave the bench, with a note for the next user.') });
              }}
            >
              {checkIn.isPending ? 'Checking in…' : 'Check in'}
            </Button>
          ) : null}
          {checkedIn ? (
            <Button variant={open === 'check-out' ? 'secondary' : 'primary'} aria-expanded={open === 'check-out'} onClick={() => setOpen(open === 'check-out' ? null : 'check-out')}>
              Check out…
            </Button>
          ) : null}
          {confirmed ? (
            <Button variant="secondary" aria-expanded={open === 'cancel'} onClick={() => setOpen(open === 'cancel' ? null : 'cancel')}>
              Cancel…
            </Button>
          ) : null}
        </div>
        {confirmed && isBooking ? <p className="text-caption text-ink-500">Check-in opens {CHECK_IN_EARLY_MINUTES} minutes before the start.</p> : null}
        {open === 'check-out' && checkedIn ? (
          <CheckOutForm
            booking={booking}
            onDone={() => {
              setOpen(null);
              setDone('Checked out. Your handover note is on the booking for the next user.');
            }}
          />
        ) : null}
        {open === 'cancel' && confirmed ? (
          <CancelForm
            booking={booking}
            onDone={() => {
              setOpen(null);
              setDone('Booking cancelled.');
            }}
          />
        ) : null}
      </div>
    </Panel>
  );
}
