import { Router } from 'express';
import { createUserInputSchema, idParamsSchema, inviteUserInputSchema, updateUserInputSchema } from '../../../shared/schemas/people.js';
import { currentUser, requireRole } from '../../lib/auth.js';
import { validate } from '../../lib/validate.js';
import type { AccountMailLab } from '../mail/templates/account-mail.js';
import { inviteUser } from './invitations.service.js';
import * as people from './people.service.js';

/** Manager-only account administration: /api/users. */
export function peopleRouter(options: { lab: AccountMailLab }): Router {
  const router = Router();
  router.use(requireRole('manager'));

  router.get('/', async (_req, res) => {
    res.json({ users: await people.listUsers() });
  });

  router.post('/', validate({ body: createUserInputSchema }), async (_req, res) => {
    res.status(201).json({ user: await people.createUser(res.locals.body) });
  });

  // Invite by e-mail; inviting a pending invitee again sends a new link and retires the older ones.
  router.post('/invitations', validate({ body: inviteUserInputSchema }), async (_req, res) => {
    res.status(201).json(await inviteUser(res.locals.body, currentUser(res.locals), options.lab));
  });

  router.patch('/:id', validate({ params: idParamsSchema, body: updateUserInputSchema }), async (_req, res) => {
    res.json({ user: await people.updateUser(res.locals.params.id, res.locals.body) });
  });

  return router;
}
