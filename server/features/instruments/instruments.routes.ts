import { Router } from 'express';
import { idParamsSchema } from '../../../shared/schemas/people.js';
import {
  grantQualificationInputSchema,
  instrumentInputSchema,
  instrumentListQuerySchema,
  instrumentPatchSchema,
  qualificationParamsSchema,
} from '../../../shared/schemas/instruments.js';
import { currentUser, requireRole, requireUser } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import * as instruments from './instruments.service.js';

/** Instruments that can be booked: everyone signed in reads, managers write. /api/instruments */
export function instrumentsRouter({ timeZone }: { timeZone: string }): Router {
  const router = Router();
  const today = () => instruments.labToday(timeZone);
  router.use(requireUser);

  router.get('/', validate({ query: instrumentListQuerySchema }), async (_req, res) => {
    res.json({ instruments: await instruments.listInstruments(res.locals.query, today()) });
  });

  router.post('/', requireRole('manager'), validate({ body: instrumentInputSchema }), async (_req, res) => {
    res.status(201).json({ instrument: await instruments.createInstrument(res.locals.body, today()) });
  });

  router.get('/:id', validate({ params: idParamsSchema }), async (_req, res) => {
    res.json({ instrument: await instruments.getInstrument(res.locals.params.id, today()) });
  });

  router.patch('/:id', requireRole('manager'), validate({ params: idParamsSchema, body: instrumentPatchSchema }), async (_req, res) => {
    res.json({ instrument: await instruments.updateInstrument(res.locals.params.id, res.locals.body, today()) });
  });

  router.get('/:id/qualifications', validate({ params: idParamsSchema }), async (_req, res) => {
    res.json({ qualifications: await instruments.listQualifications(res.locals.params.id) });
  });

  router.post('/:id/qualifications', requireRole('manager'), validate({ params: idParamsSchema, body: grantQualificationInputSchema }), async (_req, res) => {
    const manager = currentUser(res.locals);
    res.status(201).json({ qualifications: await instruments.grantQualification(res.locals.params.id, res.locals.body.userId, manager.id) });
  });

  router.delete('/:id/qualifications/:userId', requireRole('manager'), validate({ params: qualificationParamsSchema }), async (_req, res) => {
    await instruments.revokeQualification(res.locals.params.id, res.locals.params.userId);
    res.status(204).end();
  });

  return router;
}
