import { Router } from 'express';
import { invitationSchema, personUpdateSchema } from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole } from '../middleware/access';
import { invitePerson, listPeople, resendInvitation, updatePerson } from '../services/people';
import { idParam, parse } from '../validate';

const owner = requireRole('owner');

/** Mounted at /people: the organisation's people and their invitation mail. */
export function peopleRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', owner, async (req, res) => {
    res.json(await listPeople(ctx, actorOf(req)));
  });
  router.post('/:id/invitation', owner, async (req, res) => {
    await resendInvitation(ctx, actorOf(req), idParam(req.params.id, 'Person'));
    res.status(202).json({});
  });
  router.patch('/:id', owner, async (req, res) => {
    res.json(await updatePerson(ctx, actorOf(req), idParam(req.params.id, 'Person'), parse(personUpdateSchema, req.body)));
  });
  return router;
}

/** Mounted at /invitations: asking a new person in. */
export function invitationsRouter(ctx: AppContext) {
  const router = Router();
  router.post('/', owner, async (req, res) => {
    res.status(201).json(await invitePerson(ctx, actorOf(req), parse(invitationSchema, req.body)));
  });
  return router;
}
