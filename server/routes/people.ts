import { Router } from 'express';
import { invitationSchema, personUpdateSchema } from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole } from '../middleware/access';
import { invitePerson, listPeople, resendInvitation, updatePerson } from '../services/people';
import { idParam, parse } from '../validate';

export function peopleRouter(ctx: AppContext) {
  const router = Router();
  const owner = requireRole('owner');

  router.get('/people', owner, async (req, res) => {
    res.json(await listPeople(ctx, actorOf(req)));
  });
  router.post('/invitations', owner, async (req, res) => {
    res.status(201).json(await invitePerson(ctx, actorOf(req), parse(invitationSchema, req.body)));
  });
  router.post('/people/:id/invitation', owner, async (req, res) => {
    await resendInvitation(ctx, actorOf(req), idParam(req.params.id, 'Person'));
    res.status(202).json({});
  });
  router.patch('/people/:id', owner, async (req, res) => {
    res.json(await updatePerson(ctx, actorOf(req), idParam(req.params.id, 'Person'), parse(personUpdateSchema, req.body)));
  });
  return router;
}
