import { Router } from 'express';
import { correctionSchema, readingsQuerySchema, roundSubmitSchema, seriesQuerySchema, type RoundSubmitAnswer } from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole, requireSignIn } from '../middleware/access';
import { replicaReads } from '../middleware/replica-reads';
import { correctReading, listReadings, submitRound, tankSeries } from '../services/readings';
import { idParam, parse } from '../validate';

// Buyers watch stock; they do not enter or correct readings.
const readers = requireRole('owner', 'manager', 'worker');

/** Mounted at /rounds: a walk's readings sent together. */
export function roundsRouter(ctx: AppContext) {
  const router = Router();
  router.post('/', readers, async (req, res) => {
    const results = await submitRound(ctx, actorOf(req), parse(roundSubmitSchema, req.body));
    res.status(results.some((r) => r.status === 'stored') ? 201 : 200).json({ results } satisfies RoundSubmitAnswer);
  });
  return router;
}

/** Mounted at /tanks: one tank's readings and its series (read on a replica when there is one). */
export function tankReadingsRouter(ctx: AppContext) {
  const router = Router();
  router.get('/:id/readings', requireSignIn, replicaReads(), async (req, res) => {
    res.json(await listReadings(ctx, actorOf(req), idParam(req.params.id, 'Tank'), parse(readingsQuerySchema, req.query)));
  });
  router.get('/:id/series', requireSignIn, replicaReads(), async (req, res) => {
    res.json(await tankSeries(ctx, actorOf(req), idParam(req.params.id, 'Tank'), parse(seriesQuerySchema, req.query)));
  });
  return router;
}

/** Mounted at /readings: corrections of one stored reading. */
export function readingsRouter(ctx: AppContext) {
  const router = Router();
  router.post('/:id/correction', readers, async (req, res) => {
    res.status(201).json(await correctReading(ctx, actorOf(req), idParam(req.params.id, 'Reading'), parse(correctionSchema, req.body)));
  });
  return router;
}
