import type { DateSelectArg, DatesSetArg, EventClickArg, EventContentArg, EventDropArg, EventInput } from '@fullcalendar/core';
import dayGridPlugin from '@fullcalendar/daygrid';
import interactionPlugin, { type EventResizeDoneArg } from '@fullcalendar/interaction';
import FullCalendar from '@fullcalendar/react';
import timeGridPlugin from '@fullcalendar/timegrid';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { useMemo, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import type { Booking } from '@shared/schemas/bookings';
import { Dialog } from '@/components/ui/dialog';
import { Notice } from '@/components/ui/feedback';
import { useUpdateBooking } from '../api/bookings.mutations';
import { bookingListOptions } from '../api/bookings.queries';
import { calendarTitle, instrumentTags, refusalLines } from '../utils/booking-text';
import { instrumentColour, maintenanceColours } from '../utils/colours';
import { formatLabRange, instantOfWallClock, labDateOf, labInputToInstant, wallClockAt } from '../utils/lab-time';
import { labTimeZonePlugin } from '../utils/lab-time-zone-plugin';
import { BookingFacts } from './booking-facts';
import { BookingForm, type BookableInstrument } from './booking-form';
import './booking-calendar.css';

export const calendarViews = { day: 'timeGridDay', week: 'timeGridWeek', month: 'dayGridMonth' } as const;
export type CalendarView = keyof typeof calendarViews;
const viewOfType = (type: string) => (Object.keys(calendarViews) as CalendarView[]).find((v) => calendarViews[v] === type) ?? 'week';

/** Cancelled bookings and no-shows freed their slot: the calendar shows only what holds an instrument. */
const holdsSlot = (b: Booking) => b.status !== 'cancelled' && b.status !== 'no-show';

function toEvent(b: Booking, instrumentIds: number[] | undefined, now: number): EventInput {
  const maintenance = b.kind === 'maintenance';
  // A booking of several instruments takes the colour of the first one the filter shows.
  const lead = b.instruments.find((i) => !instrumentIds || instrumentIds.includes(i.id)) ?? b.instruments[0];
  const colour = lead ? instrumentColour(lead.id) : maintenanceColours.border;
  const movable = b.canChange && b.status === 'confirmed' && Date.parse(b.startsAt) > now;
  return {
    id: String(b.id),
    title: calendarTitle(b),
    start: b.startsAt,
    end: b.endsAt,
    editable: movable,
    backgroundColor: maintenance ? maintenanceColours.background : colour,
    borderColor: maintenance ? maintenanceColours.border : colour,
    textColor: maintenance ? maintenanceColours.text : '#ffffff',
    classNames: maintenance ? ['sb-maintenance'] : [],
    extendedProps: { booking: b },
  };
}

function EventContent({ arg }: { arg: EventContentArg }) {
  const booking = arg.event.extendedProps.booking as Booking | undefined;
  // The placeholder drawn while dragging out a new booking has no booking behind it yet.
  if (!booking) return <div className="sb-event sb-event-time">{arg.timeText}</div>;
  return (
    <div className="sb-event">
      {booking.instruments.length > 1 && booking.kind !== 'maintenance' ? (
        <div aria-hidden className="mb-0.5 flex gap-0.5">
          {booking.instruments.map((i) => (
            <span key={i.id} className="h-1.5 flex-1 rounded-full ring-1 ring-white/70" style={{ backgroundColor: instrumentColour(i.id) }} />
          ))}
        </div>
      ) : null}
      {arg.timeText ? <div className="sb-event-time">{arg.timeText}</div> : null}
      <div className="sb-event-title">{arg.event.title}</div>
      {booking.kind === 'maintenance' ? <div className="sb-event-title">{instrumentTags(booking)}</div> : null}
    </div>
  );
}

type Feedback = { tone: 'pass' | 'fault'; title: string; lines: string[] };

interface BookingCalendarProps {
  timeZone: string;
  /** Instruments to show; undefined shows every instrument, [] none. */
  instrumentIds: number[] | undefined;
  /** What the booking form offers. */
  instruments: BookableInstrument[];
  /** Researchers and managers drag across the calendar to book; visitors only read it. */
  canBook: boolean;
  isManager: boolean;
  initialView: CalendarView;
  /** `YYYY-MM-DD` in the lab's zone. */
  initialDate?: string;
  /** After every move through the calendar, so the route can keep view and date in the URL. */
  onNavigate: (view: CalendarView, date: string) => void;
}

/**
 * The bench calendar (FullCalendar): the lab's wall clock in every browser, only the visible range fetched,
 * drag across a time range to book, drag or resize your own bookings to move them, click one for its details.
 */
export function BookingCalendar({ timeZone, instrumentIds, instruments, canBook, isManager, initialView, initialDate, onNavigate }: BookingCalendarProps) {
  const calendar = useRef<FullCalendar>(null);
  // FullCalendar reads its initial view and date once; later URL changes come from the calendar itself.
  const [initial] = useState({ view: initialView, date: initialDate });
  const [range, setRange] = useState<{ from: string; to: string } | null>(null);
  const [draft, setDraft] = useState<{ startsAt: string; endsAt: string } | null>(null);
  const [opened, setOpened] = useState<Booking | null>(null);
  const [feedback, setFeedback] = useState<Feedback | null>(null);
  const update = useUpdateBooking();

  const noneShown = instrumentIds?.length === 0;
  const bookings = useQuery({
    ...bookingListOptions({ from: range?.from ?? '', to: range?.to ?? '', instrumentIds }),
    enabled: range !== null && !noneShown,
    // Keep the last range on screen while the next one loads, instead of an empty grid.
    placeholderData: keepPreviousData,
  });
  const events = useMemo(() => {
    if (noneShown) return [];
    const now = Date.now();
    return (bookings.data ?? []).filter(holdsSlot).map((b) => toEvent(b, instrumentIds, now));
  }, [bookings.data, instrumentIds, noneShown]);

  const datesSet = (arg: DatesSetArg) => {
    setRange((prev) => (prev?.from === arg.startStr && prev.to === arg.endStr ? prev : { from: arg.startStr, to: arg.endStr }));
    onNavigate(viewOfType(arg.view.type), labDateOf(arg.view.currentStart, timeZone));
  };

  const select = (arg: DateSelectArg) => {
    if (!canBook) return;
    setFeedback(null);
    if (arg.allDay) {
      // Days picked in the month view: a working day on each, to be adjusted in the form.
      const lastDay = labDateOf(new Date(arg.end.getTime() - 1), timeZone);
      setDraft({ startsAt: labInputToInstant(`${arg.startStr}T09:00`, timeZone)!, endsAt: labInputToInstant(`${lastDay}T17:00`, timeZone)! });
    } else {
      setDraft({ startsAt: arg.start.toISOString(), endsAt: arg.end.toISOString() });
    }
  };

  const newBooking = () => {
    // The next full hour on the lab's clock, for an hour: a starting point for keyboard users, who cannot drag.
    const nextHour = (Math.floor(wallClockAt(Date.now(), timeZone) / 3_600_000) + 1) * 3_600_000;
    const startsAt = instantOfWallClock(nextHour, timeZone);
    setFeedback(null);
    setDraft({ startsAt: new Date(startsAt).toISOString(), endsAt: new Date(instantOfWallClock(nextHour + 3_600_000, timeZone)).toISOString() });
  };

  const closeForm = () => {
    setDraft(null);
    calendar.current?.getApi().unselect();
  };

  const move = (arg: EventDropArg | EventResizeDoneArg) => {
    const booking = arg.event.extendedProps.booking as Booking;
    const startsAt = arg.event.start!;
    const endsAt = arg.event.end ?? new Date(startsAt.getTime() + Date.parse(booking.endsAt) - Date.parse(booking.startsAt));
    setFeedback(null);
    update.mutate(
      { id: booking.id, changes: { startsAt: startsAt.toISOString(), endsAt: endsAt.toISOString() } },
      {
        onSuccess: ({ booking: moved }) =>
          setFeedback({ tone: 'pass', title: `Moved ${instrumentTags(moved)} to ${formatLabRange(moved.startsAt, moved.endsAt, timeZone)}.`, lines: [] }),
        onError: (error) => {
          arg.revert();
          setFeedback({ tone: 'fault', title: `${instrumentTags(booking)} stays where it was:`, lines: refusalLines(error, timeZone) });
        },
      },
    );
  };

  return (
    <div className="space-y-3">
      {feedback ? (
        <div
          role={feedback.tone === 'fault' ? 'alert' : 'status'}
          className={`flex items-start justify-between gap-3 rounded-chip px-3.5 py-2.5 text-body ring-1 ${
            feedback.tone === 'fault' ? 'bg-fault-50 text-fault-700 ring-fault-300' : 'bg-pass-50 text-pass-700 ring-pass-500/30'
          }`}
        >
          <div>
            <p className="font-semibold">{feedback.title}</p>
            {feedback.lines.length ? (
              <ul className="mt-1 list-disc pl-5">
                {feedback.lines.map((line) => (
                  <li key={line}>{line}</li>
                ))}
              </ul>
            ) : null}
          </div>
          <button type="button" className="text-caption font-semibold underline underline-offset-2" onClick={() => setFeedback(null)}>
            Dismiss
          </button>
        </div>
      ) : null}
      {bookings.isError ? <Notice tone="fault">{bookings.error.message}</Notice> : null}
      <div className="sb-calendar rounded-panel bg-white p-4 shadow-panel ring-1 ring-ink-100" aria-busy={bookings.isFetching}>
        <FullCalendar
          ref={calendar}
          plugins={[labTimeZonePlugin, timeGridPlugin, dayGridPlugin, interactionPlugin]}
          timeZone={timeZone}
          initialView={calendarViews[initial.view]}
          initialDate={initial.date}
          firstDay={1}
          headerToolbar={{ left: 'prev,next today', center: 'title', right: `${canBook ? 'newBooking ' : ''}timeGridDay,timeGridWeek,dayGridMonth` }}
          customButtons={canBook ? { newBooking: { text: 'New booking', click: newBooking } } : undefined}
          // Text, not FullCalendar's icon font: the app's CSP allows fonts from the app itself only.
          buttonIcons={false}
          buttonText={{ prev: '‹ Previous', next: 'Next ›', today: 'Today', day: 'Day', week: 'Week', month: 'Month' }}
          dayHeaderFormat={{ weekday: 'short', day: 'numeric', month: 'short', omitCommas: true }}
          slotLabelFormat={{ hour: '2-digit', minute: '2-digit', hour12: false }}
          eventTimeFormat={{ hour: '2-digit', minute: '2-digit', hour12: false }}
          allDaySlot={false}
          nowIndicator
          navLinks
          contentHeight={640}
          scrollTime="08:00:00"
          dayMaxEvents
          events={events}
          eventContent={(arg) => <EventContent arg={arg} />}
          datesSet={datesSet}
          selectable={canBook}
          selectMirror
          // No booking in the past; the server refuses them anyway.
          selectAllow={(span) => span.end.getTime() > Date.now()}
          select={select}
          editable={false}
          eventDrop={move}
          eventResize={move}
          eventClick={(arg: EventClickArg) => {
            arg.jsEvent.preventDefault();
            setOpened(arg.event.extendedProps.booking as Booking);
          }}
        />
      </div>

      {draft ? (
        <Dialog title="New booking" onClose={closeForm} className="w-[min(56rem,96vw)]">
          <BookingForm
            instruments={instruments}
            timeZone={timeZone}
            initialRange={draft}
            initialInstrumentIds={instrumentIds?.length && instrumentIds.length <= 3 ? instrumentIds : []}
            isManager={isManager}
            onBooked={(booking) => {
              closeForm();
              setFeedback({ tone: 'pass', title: `Booked ${instrumentTags(booking)}, ${formatLabRange(booking.startsAt, booking.endsAt, timeZone)}.`, lines: [] });
            }}
          />
        </Dialog>
      ) : null}
      {opened ? (
        <Dialog title={opened.kind === 'maintenance' ? `Maintenance · ${instrumentTags(opened)}` : instrumentTags(opened)} onClose={() => setOpened(null)} dismissOnBackdrop>
          <BookingFacts booking={opened} timeZone={timeZone} />
          <Link to={`/bookings/${opened.id}`} className="mt-4 inline-block font-semibold text-phase-700 underline underline-offset-4">
            Open the booking page
          </Link>
        </Dialog>
      ) : null}
    </div>
  );
}
