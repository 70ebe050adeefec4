import { Router } from 'express';
import { brewCreateSchema, brewListQuerySchema, brewTemperatureSchema, brewUpdateSchema } from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole, requireSignIn } from '../middleware/access';
import { createBrew, listBrews, logBrewTemperature, updateBrew } from '../services/brews';
import { idParam, parse } from '../validate';

export function brewsRouter(ctx: AppContext) {
  const router = Router();
  // Brews are made on the farm: buyers watch, they do not log them.
  const makers = requireRole('owner', 'manager', 'worker');
  router.get('/', requireSignIn, async (req, res) => void res.json(await listBrews(ctx, actorOf(req), parse(brewListQuerySchema, req.query))));
  router.post('/', makers, async (req, res) => void res.status(201).json(await createBrew(ctx, actorOf(req), parse(brewCreateSchema, req.body))));
  router.patch('/:id', makers, async (req, res) => void res.json(await updateBrew(ctx, actorOf(req), idParam(req.params.id, 'Brew'), parse(brewUpdateSchema, req.body))));
  router.post('/:id/temperatures', makers, async (req, res) => void res.status(201).json(await logBrewTemperature(ctx, actorOf(req), idParam(req.params.id, 'Brew'), parse(brewTemperatureSchema, req.body))));
  return router;
}
