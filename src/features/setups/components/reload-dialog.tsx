import { useState, type FormEvent } from 'react';
import type { Setup } from '@shared/schemas/setups';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState, Notice } from '@/components/ui/feedback';
import { useReloadSetup } from '../api/setups.mutations';

export interface BookingChoice {
  id: number;
  label: string;
}

interface ReloadDialogProps {
  setupId: number;
  revision: number;
  /** The person's bookings this setup could be reloaded into (not its own booking). */
  bookings: BookingChoice[];
  onClose: () => void;
  onReloaded: (setup: Setup) => void;
}

/** Start a new setup for another booking from this revision: same wiring and settings, its own history. */
export function ReloadDialog({ setupId, revision, bookings, onClose, onReloaded }: ReloadDialogProps) {
  const reload = useReloadSetup(setupId);
  const [bookingId, setBookingId] = useState<number | null>(bookings[0]?.id ?? null);
  const submit = (event: FormEvent) => {
    event.preventDefault();
    if (bookingId === null) return;
    reload.mutate({ bookingId, revision }, { onSuccess: ({ setup }) => onReloaded(setup) });
  };
  return (
    <Dialog title="Reload into another booking" onClose={onClose}>
      {bookings.length === 0 ? (
        <EmptyState title="No other booking to reload into">Book the bench first; your bookings are listed here.</EmptyState>
      ) : (
        <form onSubmit={submit} noValidate className="space-y-4">
          <p className="text-body text-ink-600">A new setup starts from revision {revision} for the booking you choose. This setup stays as it is.</p>
          {reload.error ? <Notice tone="fault">{reload.error.message}</Notice> : null}
          <fieldset>
            <legend className="text-caption font-semibold uppercase tracking-wide text-ink-600">Booking</legend>
            <div className="mt-1 space-y-1">
              {bookings.map((b) => (
                <label key={b.id} className="flex items-start gap-2.5 rounded-chip px-2 py-1.5 hover:bg-ptfe-100">
                  <input type="radio" name="booking" className="mt-1 accent-copper-600" checked={bookingId === b.id} onChange={() => setBookingId(b.id)} />
                  <span className="text-body text-ink-800">{b.label}</span>
                </label>
              ))}
            </div>
          </fieldset>
          <Button type="submit" disabled={reload.isPending || bookingId === null}>
            {reload.isPending ? 'Reloading…' : 'Reload'}
          </Button>
        </form>
      )}
    </Dialog>
  );
}
