import { Router } from 'express';
import { flagAckSchema, flagClearSchema, flagListQuerySchema } from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole, requireSignIn } from '../middleware/access';
import { acknowledgeFlag, clearFlag, listFlags } from '../services/flags';
import { idParam, parse } from '../validate';

export function flagsRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', requireSignIn, async (req, res) => {
    res.json(await listFlags(ctx, actorOf(req), parse(flagListQuerySchema, req.query)));
  });
  router.post('/:id/acknowledge', requireSignIn, async (req, res) => {
    res.json(await acknowledgeFlag(ctx, actorOf(req), idParam(req.params.id, 'Flag'), parse(flagAckSchema, req.body).note));
  });
  router.post('/:id/clear', requireRole('owner', 'manager'), async (req, res) => {
    res.json(await clearFlag(ctx, actorOf(req), idParam(req.params.id, 'Flag'), parse(flagClearSchema, req.body).note));
  });
  return router;
}
