import { Router } from 'express';
import { z } from 'zod';
import { compareQuerySchema, createSetupInputSchema, reloadSetupInputSchema, saveRevisionInputSchema, setupListQuerySchema } from '../../../shared/schemas/setups.js';
import { idParamsSchema } from '../../../shared/schemas/people.js';
import { currentUser, requireUser } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import * as setups from './setups.service.js';

const revisionParams = idParamsSchema.extend({ number: z.coerce.number({ error: 'number must be a revision number' }).int().positive().max(1_000_000) });

/** Setup records and their revisions: /api/setups (everyone signed in reads; owners of the booking and managers write). */
export function setupsRouter(): Router {
  const router = Router();
  router.use(requireUser);

  router.get('/', validate({ query: setupListQuerySchema }), async (_req, res) => {
    res.json({ setups: await setups.listSetups(currentUser(res.locals), res.locals.query) });
  });
  router.get('/compare', validate({ query: compareQuerySchema }), async (_req, res) => {
    res.json({ diff: await setups.compareRevisions(res.locals.query.from, res.locals.query.to) });
  });
  router.post('/', validate({ body: createSetupInputSchema }), async (_req, res) => {
    res.status(201).json({ setup: await setups.createSetup(currentUser(res.locals), res.locals.body) });
  });
  router.get('/:id', validate({ params: idParamsSchema }), async (_req, res) => {
    res.json({ setup: await setups.getSetup(currentUser(res.locals), res.locals.params.id) });
  });
  router.put('/:id', validate({ params: idParamsSchema, body: saveRevisionInputSchema }), async (_req, res) => {
    res.json({ setup: await setups.saveRevision(currentUser(res.locals), res.locals.params.id, res.locals.body) });
  });
  router.post('/:id/reload', validate({ params: idParamsSchema, body: reloadSetupInputSchema }), async (_req, res) => {
    res.status(201).json({ setup: await setups.reloadSetup(currentUser(res.locals), res.locals.params.id, res.locals.body) });
  });
  router.get('/:id/revisions/:number', validate({ params: revisionParams }), async (_req, res) => {
    res.json({ setup: await setups.getSetup(currentUser(res.locals), res.locals.params.id, res.locals.params.number) });
  });
  router.get('/:id/revisions/:number/paths.csv', validate({ params: revisionParams }), async (_req, res) => {
    const csv = await setups.pathsCsv(res.locals.params.id, res.locals.params.number);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="setup-${res.locals.params.id}-rev${res.locals.params.number}.csv"`);
    res.send(csv);
  });
  return router;
}
