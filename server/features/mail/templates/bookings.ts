// The messages about bookings and the bench: confirmed (with an .ics), changed, cancelled, released after a
// missed check-in, the handover to the next booker, and a freed slot offered from the waitlist. Pure: the
// data comes in, a rendered message goes out; server/features/bookings/booking.mail.ts loads and queues them.
import ical, { ICalCalendarMethod } from 'ical-generator';
import { zoneOffsetMinutes } from '../../../../shared/domain/lab-time.js';
import type { RenderedMail } from '../outbox.service.js';
import { absoluteUrl, composeMail, type MailLab } from './compose.js';

/** The lab as booking messages need it: name, PUBLIC_URL, and the time zone its bench times are read in. */
export interface BookingMailLab extends MailLab {
  timeZone: string;
}

export interface MailInstrument {
  id: number;
  tag: string;
  name: string;
  location: string;
}

/** One booking as the messages show it. */
export interface MailBooking {
  id: number;
  kind: 'booking' | 'maintenance';
  ownerName: string;
  startsAt: Date;
  endsAt: Date;
  purpose: string;
  projectCode: string;
  notes: string;
  instruments: MailInstrument[];
  createdAt: Date;
  updatedAt: Date;
}

// ---------------------------------------------------------------- times and names

const dayFormats = new Map<string, Intl.DateTimeFormat>();
const timeFormats = new Map<string, Intl.DateTimeFormat>();

function format(cache: Map<string, Intl.DateTimeFormat>, timeZone: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  let f = cache.get(timeZone);
  if (!f) cache.set(timeZone, (f = new Intl.DateTimeFormat('en-GB', { timeZone, ...options })));
  return f;
}
const labDay = (instant: Date, timeZone: string) =>
  format(dayFormats, timeZone, { weekday: 'short', day: 'numeric', month: 'short', year: 'numeric' }).format(instant).replace(',', '');
const labClock = (instant: Date, timeZone: string) => format(timeFormats, timeZone, { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(instant);

/** `Europe/Berlin, UTC+1`: the zone by name, and its offset at that instant for readers elsewhere. */
export function zoneLabel(instant: Date, timeZone: string): string {
  const minutes = zoneOffsetMinutes(instant, timeZone);
  const sign = minutes < 0 ? '−' : '+';
  const abs = Math.abs(minutes);
  const offset = minutes === 0 ? 'UTC' : `UTC${sign}${Math.floor(abs / 60)}${abs % 60 ? `:${String(abs % 60).padStart(2, '0')}` : ''}`;
  return `${timeZone}, ${offset}`;
}

/** `Thu 3 Dec 2026, 14:05 (Europe/Berlin, UTC+1)` on the lab's clock. */
export function formatLabInstant(instant: Date, timeZone: string): string {
  return `${labDay(instant, timeZone)}, ${labClock(instant, timeZone)} (${zoneLabel(instant, timeZone)})`;
}

/** `Thu 3 Dec 2026, 13:00–17:00 (Europe/Berlin, UTC+1)`; a range over midnight names both days. */
export function formatLabRange(start: Date, end: Date, timeZone: string): string {
  const firstDay = labDay(start, timeZone);
  const lastDay = labDay(end, timeZone);
  const zone = zoneLabel(start, timeZone);
  const endZone = zoneLabel(end, timeZone);
  const zones = zone === endZone ? zone : `${zone} → ${endZone.replace(`${timeZone}, `, '')}`;
  return firstDay === lastDay
    ? `${firstDay}, ${labClock(start, timeZone)}–${labClock(end, timeZone)} (${zones})`
    : `${firstDay}, ${labClock(start, timeZone)} – ${lastDay}, ${labClock(end, timeZone)} (${zones})`;
}

/** `PS-1 + SG-1`, as the calendar feeds name a booking's instruments. */
export const instrumentTags = (instruments: { tag: string }[]) => instruments.map((i) => i.tag).join(' + ');

/** `PS-1 (Probe station …), SG-1 (Signal generator …)` */
const instrumentNames = (instruments: MailInstrument[]) => instruments.map((i) => `${i.tag} (${i.name})`).join(', ');

const bookingLink = (id: number) => `/bookings/${id}`;

function bookingFacts(lab: BookingMailLab, b: MailBooking): [string, string][] {
  const facts: [string, string][] = [
    [b.instruments.length > 1 ? 'Instruments' : 'Instrument', instrumentNames(b.instruments)],
    ['When', formatLabRange(b.startsAt, b.endsAt, lab.timeZone)],
  ];
  const where = [...new Set(b.instruments.map((i) => i.location).filter(Boolean))].join('; ');
  if (where) facts.push(['Where', where]);
  if (b.purpose) facts.push([b.kind === 'maintenance' ? 'Work' : 'Purpose', b.purpose]);
  if (b.projectCode) facts.push(['Project', b.projectCode]);
  if (b.notes) facts.push(['Notes', b.notes]);
  return facts;
}

const bookingUpdatesFooter = (lab: BookingMailLab) => [
  `You receive this because the booking is yours at ${lab.name}.`,
  `Messages about your bookings can be switched off on your account page ("My bookings"): ${absoluteUrl(lab, '/account')}`,
];

// ---------------------------------------------------------------- the .ics of a booking

/** The UID a booking has everywhere (feeds and mail), so calendar programs see one event (RFC 5545 §3.8.4.7). */
export const bookingUid = (lab: MailLab, bookingId: number) => `booking-${bookingId}@${new URL(lab.publicUrl).host}`;

/**
 * One booking as an iCalendar object (RFC 5545), as the calendar feeds write it: UTC times, the same UID and
 * SUMMARY, the instruments' locations and a link back. METHOD:PUBLISH says it is a copy to keep, not an
 * invitation to answer; with a METHOD, DTSTAMP is when the object was made (§3.8.7.2).
 */
export function bookingIcs(lab: BookingMailLab, b: MailBooking, now: Date): string {
  const calendar = ical({ prodId: { company: 'Skewbench', product: 'Bench bookings', language: 'EN' }, method: ICalCalendarMethod.PUBLISH });
  const tags = instrumentTags(b.instruments);
  const link = absoluteUrl(lab, bookingLink(b.id));
  calendar.createEvent({
    id: bookingUid(lab, b.id),
    stamp: now,
    created: b.createdAt,
    lastModified: b.updatedAt,
    start: b.startsAt,
    end: b.endsAt,
    summary: b.kind === 'maintenance' ? `Maintenance: ${tags}` : b.purpose ? `${tags} · ${b.purpose}` : `${tags} booked`,
    location: [...new Set(b.instruments.map((i) => i.location).filter(Boolean))].join('; ') || null,
    description: [b.purpose, b.projectCode && `Project ${b.projectCode}`, `${lab.name}`, `Details: ${link}`].filter(Boolean).join('\n'),
    url: link,
  });
  // §3.4: the object ends with CRLF, which ical-generator leaves off.
  return `${calendar.toString()}\r\n`;
}

// ---------------------------------------------------------------- messages

export function bookingConfirmedMail(lab: BookingMailLab, recipientName: string, b: MailBooking, now: Date): RenderedMail {
  const tags = instrumentTags(b.instruments);
  return composeMail(lab, {
    subject: `Booked: ${tags}, ${formatLabRange(b.startsAt, b.endsAt, lab.timeZone)}`,
    recipientName,
    lead: [`Your booking of ${tags} is confirmed. The bench is yours for this slot; check in at the bench from 15 minutes before the start.`],
    facts: bookingFacts(lab, b),
    action: { label: 'Open the booking', url: bookingLink(b.id) },
    after: [
      'The attached calendar file (.ics) puts the slot in your calendar. Not checked in 30 minutes after the start, the booking is released for others.',
    ],
    footer: bookingUpdatesFooter(lab),
    attachments: [{ filename: `booking-${b.id}.ics`, contentType: 'text/calendar', content: Buffer.from(bookingIcs(lab, b, now), 'utf8').toString('base64') }],
  });
}

export interface BookingChange {
  /** The slot before the move; null when only the texts changed. */
  movedFrom: { startsAt: Date; endsAt: Date } | null;
  /** Labels of the texts that changed: "purpose", "project code", "notes". */
  editedTexts: string[];
  /** Who changed it when that was not the owner (a lab manager); null when the owner did it. */
  changedBy: string | null;
}

export function bookingChangedMail(lab: BookingMailLab, recipientName: string, b: MailBooking, change: BookingChange): RenderedMail {
  const tags = instrumentTags(b.instruments);
  const what = change.movedFrom ? 'moved' : 'changed';
  const lead = [
    change.changedBy
      ? `${change.changedBy}, a lab manager, ${what} your ${b.kind === 'maintenance' ? 'maintenance block' : 'booking'} of ${tags}.`
      : `Your ${b.kind === 'maintenance' ? 'maintenance block' : 'booking'} of ${tags} was ${what}, as you asked.`,
  ];
  if (change.movedFrom) lead.push(`It was ${formatLabRange(change.movedFrom.startsAt, change.movedFrom.endsAt, lab.timeZone)}; it is now ${formatLabRange(b.startsAt, b.endsAt, lab.timeZone)}.`);
  if (change.editedTexts.length) lead.push(`Changed: ${change.editedTexts.join(', ')}.`);
  const facts = bookingFacts(lab, b);
  if (change.changedBy) facts.push(['Changed by', change.changedBy]);
  return composeMail(lab, {
    subject: `${change.movedFrom ? 'Moved' : 'Changed'}: ${tags}, ${formatLabRange(b.startsAt, b.endsAt, lab.timeZone)}`,
    recipientName,
    lead,
    facts,
    action: { label: 'Open the booking', url: bookingLink(b.id) },
    after: change.movedFrom ? ['A calendar entry you made from the confirmation keeps the old time: open the booking for the new one, or subscribe to your calendar feed.'] : [],
    footer: bookingUpdatesFooter(lab),
  });
}

export function bookingCancelledMail(lab: BookingMailLab, recipientName: string, b: MailBooking, cancel: { reason: string; cancelledBy: string; byOwner: boolean }): RenderedMail {
  const tags = instrumentTags(b.instruments);
  const block = b.kind === 'maintenance' ? 'maintenance block' : 'booking';
  return composeMail(lab, {
    subject: `Cancelled: ${tags}, ${formatLabRange(b.startsAt, b.endsAt, lab.timeZone)}`,
    recipientName,
    lead: [
      cancel.byOwner ? `You cancelled your ${block} of ${tags}. The slot is free again for others.` : `${cancel.cancelledBy}, a lab manager, cancelled your ${block} of ${tags}. The slot is free again.`,
    ],
    facts: [...bookingFacts(lab, b), ['Cancelled by', cancel.byOwner ? `${cancel.cancelledBy} (you)` : cancel.cancelledBy]],
    blocks: [{ heading: 'Reason given', text: cancel.reason }],
    action: { label: 'Open the booking', url: bookingLink(b.id) },
    after: cancel.byOwner ? [] : ['If you still need the bench, book another slot on the calendar or ask the lab manager.'],
    footer: bookingUpdatesFooter(lab),
  });
}

export function noShowMail(lab: BookingMailLab, recipientName: string, b: MailBooking, releasedFrom: Date, afterMinutes: number): RenderedMail {
  const tags = instrumentTags(b.instruments);
  const released = releasedFrom < b.endsAt;
  return composeMail(lab, {
    subject: `Released: ${tags}, ${formatLabRange(b.startsAt, b.endsAt, lab.timeZone)} (not checked in)`,
    recipientName,
    lead: [
      `Your booking of ${tags} was not checked in ${afterMinutes} minutes after its start, so it is marked as a no-show.`,
      released
        ? `The rest of the slot, from ${formatLabInstant(releasedFrom, lab.timeZone)}, was released for others to book.`
        : 'The slot had already ended, so nothing was left to release.',
    ],
    facts: bookingFacts(lab, b),
    action: { label: 'Open the booking', url: bookingLink(b.id) },
    after: ['If you are at the bench after all, book the free time again on the calendar and check in.'],
    footer: bookingUpdatesFooter(lab),
  });
}

export interface HandoverNext {
  bookingId: number;
  /** A booking, or a maintenance block that comes before the next booking (its lab manager is at the bench first). */
  kind: MailBooking['kind'];
  startsAt: Date;
  endsAt: Date;
  /** The instruments of this booking that the checked-out booking also held. */
  instruments: MailInstrument[];
}

export interface Handover {
  /** Who checked out, and whose booking it was (usually the same person). */
  checkedOutBy: string;
  previousBooker: string;
  checkedOutAt: Date;
  /** The instruments that became free, of the checked-out booking. */
  freed: MailInstrument[];
  note: string;
  leftConnected: string | null;
  /** The latest setup recorded for the checked-out booking. */
  setup: { id: number; title: string } | null;
  /** The recipient's next bookings (and maintenance blocks) on those instruments, in time order. */
  next: HandoverNext[];
}

const slotWord = (n: HandoverNext) => (n.kind === 'maintenance' ? 'maintenance block' : 'booking');

export function handoverMail(lab: BookingMailLab, recipientName: string, h: Handover): RenderedMail {
  // A manager may have a maintenance block and then a booking of the same instrument: name each tag once.
  const nextTags = [...new Set(h.next.flatMap((n) => n.instruments.map((i) => i.tag)))].join(' + ');
  const bookedBy = h.checkedOutBy === h.previousBooker ? h.previousBooker : `${h.previousBooker} (checked out by ${h.checkedOutBy})`;
  const labelOf = (n: HandoverNext) => {
    const sameKind = h.next.filter((x) => x.kind === n.kind);
    const word = n.kind === 'maintenance' ? 'Your maintenance block' : 'Your booking';
    return sameKind.length > 1 ? `${word} ${sameKind.indexOf(n) + 1}` : word;
  };
  const facts: [string, string][] = [
    ['Bench free since', formatLabInstant(h.checkedOutAt, lab.timeZone)],
    ['Left by', bookedBy],
    [h.freed.length > 1 ? 'Instruments' : 'Instrument', instrumentNames(h.freed)],
    ...h.next.map((n): [string, string] => [labelOf(n), `${instrumentTags(n.instruments)}, ${formatLabRange(n.startsAt, n.endsAt, lab.timeZone)}`]),
    ['Setup on the bench', h.setup ? h.setup.title : 'none recorded'],
  ];
  // Each instrument has one next booking and at most one block before it, so kind and tags tell them apart.
  const links = h.next.map((n) => ({ label: `Open your ${slotWord(n)} of ${instrumentTags(n.instruments)}`, url: bookingLink(n.bookingId) }));
  const blocks = [{ heading: 'Handover note', text: h.note }];
  if (h.leftConnected) blocks.push({ heading: 'Left connected', text: h.leftConnected });
  const maintenance = h.next.filter((n) => n.kind === 'maintenance');
  const onlyMaintenance = maintenance.length === h.next.length;
  const finished = `${h.previousBooker} has finished on ${instrumentTags(h.freed)} and left a handover note.`;
  const lead = onlyMaintenance
    ? `${finished} Your maintenance block${maintenance.length > 1 ? 's on' : ' on'} ${nextTags} ${maintenance.length > 1 ? 'are' : 'is'} the next work on the bench, so here is what they left on it.`
    : `${finished} Your next ${h.next.length === 1 ? 'booking uses' : maintenance.length ? 'booking and maintenance use' : 'bookings use'} ${nextTags}, so here is what they left on the bench.`;
  return composeMail(lab, {
    subject: `Handover for ${nextTags}: note from ${h.previousBooker}`,
    recipientName,
    lead: [lead],
    facts,
    blocks,
    links,
    action: h.setup ? { label: 'See the setup left on the bench', url: `/setups/${h.setup.id}` } : undefined,
    after: h.setup ? [] : ['No setup was recorded for that booking: check the bench before you start.'],
    footer: [
      onlyMaintenance
        ? `You receive this because your maintenance work on ${nextTags} comes next on the bench at ${lab.name}. Handover notes always go to whoever works on the bench next.`
        : `You receive this because you have the next booking of ${nextTags} at ${lab.name}. Handover notes always go to the next booker.`,
    ],
  });
}

export interface WaitlistOffer {
  entryId: number;
  instrument: MailInstrument;
  /** The offered time: the part of the waited-for slot that became free, from the offer on; the claim books it. */
  startsAt: Date;
  endsAt: Date;
  /** The whole slot the person waits for. */
  waitedFrom: Date;
  waitedTo: Date;
  note: string;
}

export function waitlistOfferMail(lab: BookingMailLab, recipientName: string, o: WaitlistOffer): RenderedMail {
  const offered = formatLabRange(o.startsAt, o.endsAt, lab.timeZone);
  const whole = o.startsAt.getTime() <= o.waitedFrom.getTime() && o.endsAt.getTime() >= o.waitedTo.getTime();
  const facts: [string, string][] = [
    ['Instrument', instrumentNames([o.instrument])],
    ['Offered to you', offered],
  ];
  if (!whole) facts.push(['You wait for', formatLabRange(o.waitedFrom, o.waitedTo, lab.timeZone)]);
  if (o.instrument.location) facts.push(['Where', o.instrument.location]);
  if (o.note) facts.push(['Your note', o.note]);
  return composeMail(lab, {
    subject: `Free now: ${o.instrument.tag}, ${offered}`,
    recipientName,
    lead: [
      whole
        ? `The slot of ${o.instrument.tag} that you are waiting for has become free, and you are first in the queue.`
        : `Part of the time you are waiting for on ${o.instrument.tag} has become free, and you are first in the queue: ${offered}.`,
    ],
    facts,
    action: { label: 'Book this slot', url: `/waitlist/${o.entryId}/claim` },
    after: [
      `The button books ${whole ? 'the slot' : 'this freed part'} for you if it is still free; the usual booking rules apply. Others can book free time too, so do not wait long.`,
      ...(whole ? [] : ['Booking it closes this place on the waitlist: if you still need the rest of your time, join the waitlist again for it.']),
    ],
    footer: [`You receive this because you joined the waitlist for ${o.instrument.tag}. Freed-slot messages can be switched off on your account page ("Freed slots"): ${absoluteUrl(lab, '/account')}`],
  });
}
