import { Router } from 'express';
import { solverInputSchema } from '../../../shared/schemas/solver.js';
import { requireRole } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import { solveForBooking } from './solver.service.js';

/** POST /api/solver: cables on the shelf for the angles wanted, in a booking's time slot (researchers and managers). */
export function solverRouter(): Router {
  const router = Router();
  router.post('/', requireRole('researcher'), validate({ body: solverInputSchema }), async (_req, res) => {
    res.json(await solveForBooking(res.locals.body));
  });
  return router;
}
