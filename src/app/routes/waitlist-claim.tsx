import { useQuery } from '@tanstack/react-query';
import { useEffect, useRef } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Loading, Notice, Panel } from '@/components/ui/feedback';
import { useClaimWaitlistOffer } from '@/features/bookings/api/bookings.mutations';
import { myWaitlistOptions } from '@/features/bookings/api/bookings.queries';
import { BookingFacts } from '@/features/bookings/components/booking-facts';
import { bookingRefusal, claimRefusal, instrumentTags, refusalLines } from '@/features/bookings/utils/booking-text';
import { formatLabRange } from '@/features/bookings/utils/lab-time';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { ApiError } from '@/lib/api-client';

const linkButton = 'inline-flex items-center rounded-chip px-3.5 py-2 text-body font-semibold transition-colors';

/** Whether [startsAt, endsAt) leaves out part of the waited-for range: then the page says which part was freed. */
const partOf = (range: { startsAt: string; endsAt: string }, waited: { startsAt: string; endsAt: string }) =>
  Date.parse(range.startsAt) > Date.parse(waited.startsAt) || Date.parse(range.endsAt) < Date.parse(waited.endsAt);

/**
 * /waitlist/:id/claim, the link of a freed-slot e-mail: opening it books the offered range (the freed part of the
 * time the person waits for) for the signed-in person (once, even when React runs the effect twice) and shows the
 * booking, or why it could not be made and what had been offered.
 */
export function WaitlistClaimRoute() {
  const id = Number(useParams().id);
  const valid = Number.isInteger(id) && id > 0;
  const lab = useQuery(labInfoOptions());
  // Only for the whole range the person waits for, which a claim does not change; the offer comes with the claim's answer.
  const waitlist = useQuery({ ...myWaitlistOptions(), enabled: valid });
  const waited = waitlist.data?.find((e) => e.id === id);
  const claim = useClaimWaitlistOffer();
  const { mutate } = claim;
  const claimed = useRef<number | null>(null);
  useEffect(() => {
    if (!valid || claimed.current === id) return;
    claimed.current = id;
    mutate(id);
  }, [id, valid, mutate]);

  const timeZone = lab.data?.timeZone;
  let body;
  if (!valid) {
    body = <Notice tone="fault">This link is incomplete: open the button of the e-mail again, or find the slot in My bookings.</Notice>;
  } else if (claim.isError) {
    const refusal = bookingRefusal(claim.error);
    const taken = claim.error instanceof ApiError && claim.error.status === 409;
    // Already booked from this offer: the way on is the booking, not another slot.
    const { entryStatus, offered } = claimRefusal(claim.error);
    const alreadyBooked = entryStatus === 'fulfilled';
    const primary = `${linkButton} bg-copper-600 text-white hover:bg-copper-700`;
    const secondary = `${linkButton} bg-white text-ink-800 ring-1 ring-inset ring-ink-200 hover:bg-ptfe-100`;
    body = (
      <Panel>
        <div className="space-y-3">
          <Notice tone={taken ? 'caution' : 'fault'}>
            <p className="font-semibold">The slot could not be booked.</p>
            <p className="mt-1">{claim.error.message}</p>
          </Notice>
          {offered && timeZone ? (
            <p className="text-body text-ink-700">
              Offered to you: <span className="font-semibold text-ink-900">{formatLabRange(offered.startsAt, offered.endsAt, timeZone)}</span>
              {waited && partOf(offered, waited) ? (
                <>, the part that became free of the time you are waiting for, {formatLabRange(waited.startsAt, waited.endsAt, timeZone)}</>
              ) : null}
              .
            </p>
          ) : null}
          {refusal && timeZone ? (
            <ul className="list-disc space-y-1 pl-5 text-body text-ink-700" aria-label="What stands in the way">
              {refusalLines(claim.error, timeZone).map((line) => (
                <li key={line}>{line}</li>
              ))}
            </ul>
          ) : null}
          <div className="flex flex-wrap gap-2 pt-1">
            {alreadyBooked ? (
              <Link to="/bookings" className={primary}>
                My bookings and waitlist
              </Link>
            ) : (
              <>
                <Link to="/calendar" className={primary}>
                  Find another slot on the calendar
                </Link>
                <Link to="/bookings" className={secondary}>
                  My bookings and waitlist
                </Link>
              </>
            )}
          </div>
        </div>
      </Panel>
    );
  } else if (claim.isSuccess && timeZone) {
    const { booking } = claim.data;
    body = (
      <div className="space-y-4">
        <Notice tone="pass">
          <p className="font-semibold">
            The slot is yours: <span className="font-mono">{instrumentTags(booking)}</span>, {formatLabRange(booking.startsAt, booking.endsAt, timeZone)}.
          </p>
          {waited && partOf(booking, waited) ? (
            <p className="mt-1">
              That is the part of the time you were waiting for ({formatLabRange(waited.startsAt, waited.endsAt, timeZone)}) that became free. To wait
              for the rest, join the waitlist again from the calendar.
            </p>
          ) : null}
          <p className="mt-1">A confirmation with a calendar file is on its way by e-mail. Check in at the bench from 15 minutes before the start.</p>
        </Notice>
        <Panel title="Your booking">
          <BookingFacts booking={booking} timeZone={timeZone} />
          <div className="mt-4">
            <Link to={`/bookings/${booking.id}`} className={`${linkButton} bg-copper-600 text-white hover:bg-copper-700`}>
              Open the booking
            </Link>
          </div>
        </Panel>
      </div>
    );
  } else if (lab.isError) {
    body = <Notice tone="fault">{lab.error.message}</Notice>;
  } else {
    body = <Loading label="Booking the freed slot for you…" />;
  }

  return (
    <div className="space-y-5">
      <div>
        <Link to="/bookings" className="text-caption font-semibold text-phase-700">
          ← My bookings
        </Link>
        <h1 className="mt-1 text-display text-ink-900">Freed slot from the waitlist</h1>
        {timeZone ? <p className="mt-1 text-body text-ink-500">Times are on the lab’s clock ({timeZone}).</p> : null}
      </div>
      {body}
    </div>
  );
}
