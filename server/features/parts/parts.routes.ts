import express, { Router } from 'express';
import { z } from 'zod';
import { idParamsSchema } from '../../../shared/schemas/people.js';
import { partInputSchema, partListQuerySchema, partPatchSchema } from '../../../shared/schemas/parts.js';
import { requireRole, requireUser } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import { parsePartsCsv, partsToCsv } from './parts.csv.js';
import * as parts from './parts.service.js';

/** Cables and passive RF parts: everyone signed in reads, managers write. /api/parts */
export function partsRouter(): Router {
  const router = Router();
  router.use(requireUser);

  router.get('/', validate({ query: partListQuerySchema }), async (_req, res) => {
    res.json({ parts: await parts.listParts(res.locals.query) });
  });

  router.get('/export.csv', async (_req, res) => {
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', 'attachment; filename="skewbench-parts.csv"');
    res.send(partsToCsv(await parts.allPartValues()));
  });

  // The CSV arrives as the request body (Content-Type text/csv); every row is checked before anything is stored.
  router.post(
    '/import',
    requireRole('manager'),
    express.text({ type: ['text/csv', 'text/plain', 'application/csv'], limit: '2mb' }),
    validate({ body: z.string({ error: 'Send the CSV file as the request body with Content-Type text/csv' }) }),
    async (_req, res) => {
      const rows = parsePartsCsv(res.locals.body);
      res.status(201).json({ imported: await parts.importParts(rows) });
    },
  );

  router.post('/', requireRole('manager'), validate({ body: partInputSchema }), async (_req, res) => {
    res.status(201).json({ part: await parts.createPart(res.locals.body) });
  });

  router.get('/:id', validate({ params: idParamsSchema }), async (_req, res) => {
    res.json({ part: await parts.getPart(res.locals.params.id) });
  });

  router.patch('/:id', requireRole('manager'), validate({ params: idParamsSchema, body: partPatchSchema }), async (_req, res) => {
    res.json({ part: await parts.updatePart(res.locals.params.id, res.locals.body) });
  });

  return router;
}
