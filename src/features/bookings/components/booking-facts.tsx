import type { ReactNode } from 'react';
import { bookingStatusLabels, type Booking, type BookingStatus } from '@shared/schemas/bookings';
import { Badge } from '@/components/ui/feedback';
import { instrumentColour } from '../utils/colours';
import { formatLabDateTime, formatLabRange } from '../utils/lab-time';

const statusTones: Record<BookingStatus, 'info' | 'pass' | 'muted' | 'caution'> = {
  confirmed: 'info',
  'checked-in': 'pass',
  completed: 'muted',
  cancelled: 'muted',
  'no-show': 'caution',
};

export function BookingStatusBadge({ booking }: { booking: Pick<Booking, 'status' | 'kind'> }) {
  if (booking.kind === 'maintenance' && booking.status === 'confirmed') return <Badge tone="muted">Maintenance</Badge>;
  return <Badge tone={statusTones[booking.status]}>{bookingStatusLabels[booking.status]}</Badge>;
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-caption font-semibold uppercase tracking-wide text-ink-500">{label}</dt>
      <dd className="mt-0.5 text-body text-ink-800">{children}</dd>
    </div>
  );
}

/**
 * What a booking is: instruments, time in the lab's zone, status, who and why (when the role may see it).
 * `full` adds the notes and the hand-over, for the booking page.
 */
export function BookingFacts({ booking: b, timeZone, full = false }: { booking: Booking; timeZone: string; full?: boolean }) {
  return (
    <dl className={`grid gap-4 ${full ? 'sm:grid-cols-2 lg:grid-cols-3' : 'sm:grid-cols-2'}`}>
      <Fact label="When">{formatLabRange(b.startsAt, b.endsAt, timeZone)}</Fact>
      <Fact label="Status">
        <BookingStatusBadge booking={b} />
      </Fact>
      <div className={full ? 'sm:col-span-2 lg:col-span-1' : 'sm:col-span-2'}>
        <Fact label="Instruments">
          <ul className="space-y-0.5">
            {b.instruments.map((i) => (
              <li key={i.id} className="flex items-baseline gap-2">
                <span aria-hidden className="h-3 w-3 shrink-0 self-center rounded-sm" style={{ backgroundColor: instrumentColour(i.id) }} />
                <span className="shrink-0 whitespace-nowrap font-mono font-semibold">{i.tag}</span> <span className="text-ink-600">{i.name}</span>
              </li>
            ))}
          </ul>
        </Fact>
      </div>
      {b.owner ? <Fact label={b.kind === 'maintenance' ? 'Blocked by' : 'Booked by'}>{b.owner.name}</Fact> : null}
      {b.purpose !== null ? <Fact label="Purpose">{b.purpose || '—'}</Fact> : null}
      {b.projectCode !== null ? <Fact label="Project">{b.projectCode || '—'}</Fact> : null}
      {b.calibrationOverride ? <Fact label="Calibration">Booked with a manager’s override of an overdue calibration</Fact> : null}
      {full && b.notes ? (
        <div className="sm:col-span-2 lg:col-span-3">
          <Fact label="Notes">
            <span className="whitespace-pre-line">{b.notes}</span>
          </Fact>
        </div>
      ) : null}
      {full && b.checkedInAt ? <Fact label="Checked in">{formatLabDateTime(b.checkedInAt, timeZone)}</Fact> : null}
      {full && b.checkedOutAt ? <Fact label="Checked out">{formatLabDateTime(b.checkedOutAt, timeZone)}</Fact> : null}
      {full && b.cancelledAt ? <Fact label="Cancelled">{formatLabDateTime(b.cancelledAt, timeZone)}{b.cancelReason ? ` — ${b.cancelReason}` : ''}</Fact> : null}
      {full && b.handoverNote ? (
        <div className="sm:col-span-2 lg:col-span-3">
          <Fact label="Handover note">
            <span className="whitespace-pre-line">{b.handoverNote}</span>
          </Fact>
        </div>
      ) : null}
      {full && b.leftConnected ? (
        <div className="sm:col-span-2 lg:col-span-3">
          <Fact label="Left connected">
            <span className="whitespace-pre-line">{b.leftConnected}</span>
          </Fact>
        </div>
      ) : null}
    </dl>
  );
}
