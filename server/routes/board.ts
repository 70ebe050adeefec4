import { Router } from 'express';
import type { AppContext } from '../context';
import { actorOf, requireSignIn } from '../middleware/access';
import { boardHistory, stockBoard } from '../services/board';

export function boardRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', requireSignIn, async (req, res) => {
    res.json(await stockBoard(ctx, actorOf(req)));
  });
  router.get('/history', requireSignIn, async (req, res) => {
    res.json(await boardHistory(ctx, actorOf(req), 14));
  });
  return router;
}
