import { Router } from 'express';
import {
  cancelInputSchema,
  checkOutInputSchema,
  createBookingInputSchema,
  createWaitlistInputSchema,
  listBookingsQuerySchema,
  updateBookingInputSchema,
} from '../../../shared/schemas/bookings.js';
import { idParamsSchema } from '../../../shared/schemas/people.js';
import { currentUser, requireRole, requireUser } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import type { MailLab } from '../mail/templates/compose.js';
import * as bookings from './bookings.service.js';
import { claimWaitlistOffer } from './waitlist-claim.service.js';
import * as waitlist from './waitlist.service.js';

/**
 * Bookings and maintenance blocks: /api/bookings; the waitlist: /api/waitlist. `lab` (name and PUBLIC_URL) goes
 * into the messages the changes queue.
 */
export function bookingsRouter({ timeZone, lab, now = () => new Date() }: { timeZone: string; lab: MailLab; now?: () => Date }): { bookings: Router; waitlist: Router } {
  const clock = () => ({ now: now(), timeZone });
  const b = Router();
  b.use(requireUser);

  b.get('/', validate({ query: listBookingsQuerySchema }), async (_req, res) => {
    res.type('application/json').send(await bookings.listBookingsJson(currentUser(res.locals), res.locals.query));
  });
  b.get('/mine', requireRole('researcher'), async (_req, res) => {
    res.json(await bookings.myBookings(currentUser(res.locals), now()));
  });
  b.post('/', validate({ body: createBookingInputSchema }), async (_req, res) => {
    res.status(201).json({ booking: await bookings.createBooking(currentUser(res.locals), res.locals.body, clock(), lab) });
  });
  b.get('/:id', validate({ params: idParamsSchema }), async (_req, res) => {
    res.json(await bookings.getBooking(currentUser(res.locals), res.locals.params.id));
  });
  b.patch('/:id', requireRole('researcher'), validate({ params: idParamsSchema, body: updateBookingInputSchema }), async (_req, res) => {
    res.json({ booking: await bookings.updateBooking(currentUser(res.locals), res.locals.params.id, res.locals.body, clock(), lab) });
  });
  b.post('/:id/check-in', requireRole('researcher'), validate({ params: idParamsSchema }), async (_req, res) => {
    res.json({ booking: await bookings.checkIn(currentUser(res.locals), res.locals.params.id, clock()) });
  });
  b.post('/:id/check-out', requireRole('researcher'), validate({ params: idParamsSchema, body: checkOutInputSchema }), async (_req, res) => {
    res.json({ booking: await bookings.checkOut(currentUser(res.locals), res.locals.params.id, res.locals.body, clock(), lab) });
  });
  b.post('/:id/cancel', requireRole('researcher'), validate({ params: idParamsSchema, body: cancelInputSchema }), async (_req, res) => {
    res.json({ booking: await bookings.cancelBooking(currentUser(res.locals), res.locals.params.id, res.locals.body.reason, clock(), lab) });
  });

  const w = Router();
  w.use(requireUser);
  w.get('/mine', requireRole('researcher'), async (_req, res) => {
    res.json({ entries: await waitlist.myWaitlist(currentUser(res.locals), now()) });
  });
  w.get('/instrument/:id', validate({ params: idParamsSchema }), async (_req, res) => {
    res.json({ entries: await waitlist.instrumentWaitlist(currentUser(res.locals), res.locals.params.id, now()) });
  });
  w.post('/', validate({ body: createWaitlistInputSchema }), async (_req, res) => {
    res.status(201).json({ entry: await waitlist.joinWaitlist(currentUser(res.locals), res.locals.body, now()) });
  });
  // The link of a waitlist offer's message: books the freed slot if it is still free.
  w.post('/:id/claim', requireRole('researcher'), validate({ params: idParamsSchema }), async (_req, res) => {
    res.status(201).json({ booking: await claimWaitlistOffer(currentUser(res.locals), res.locals.params.id, clock(), lab) });
  });
  w.delete('/:id', requireRole('researcher'), validate({ params: idParamsSchema }), async (_req, res) => {
    await waitlist.leaveWaitlist(currentUser(res.locals), res.locals.params.id);
    res.status(204).end();
  });
  return { bookings: b, waitlist: w };
}
