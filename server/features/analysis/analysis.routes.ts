import { Router } from 'express';
import { analysisInputSchema } from '../../../shared/schemas/analysis.js';
import { requireUser } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import { analyse } from './analysis.service.js';

/** POST /api/analysis: evaluate an unsaved setup document (any signed-in role; lab scripts use it too). */
export function analysisRouter(): Router {
  const router = Router();
  router.post('/', requireUser, validate({ body: analysisInputSchema }), async (_req, res) => {
    res.json(await analyse(res.locals.body));
  });
  return router;
}
