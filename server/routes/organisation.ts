import { Router } from 'express';
import { organisationSettingsSchema } from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole, requireSignIn } from '../middleware/access';
import { getOrganisation, updateOrganisation } from '../services/organisation';
import { parse } from '../validate';

export function organisationRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', requireSignIn, async (req, res) => void res.json(await getOrganisation(ctx, actorOf(req))));
  router.patch('/', requireRole('owner'), async (req, res) => void res.json(await updateOrganisation(ctx, actorOf(req), parse(organisationSettingsSchema, req.body))));
  return router;
}
