import { Router } from 'express';
import { createUserInputSchema, idParamsSchema, updateUserInputSchema } from '../../../shared/schemas/people.js';
import { requireRole } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import * as people from './people.service.js';

/** Manager-only account administration: /api/users. */
export function peopleRouter(): Router {
  const router = Router();
  router.use(requireRole('manager'));

  router.get('/', async (_req, res) => {
    res.json({ users: await people.listUsers() });
  });

  router.post('/', validate({ body: createUserInputSchema }), async (_req, res) => {
    res.status(201).json({ user: await people.createUser(res.locals.body) });
  });

  router.patch('/:id', validate({ params: idParamsSchema, body: updateUserInputSchema }), async (_req, res) => {
    res.json({ user: await people.updateUser(res.locals.params.id, res.locals.body) });
  });

  return router;
}
