import { Router } from 'express';
import type { AppContext } from '../context';
import { actorOf, requireSignIn } from '../middleware/access';
import { boardHistory, stockBoardJson } from '../services/board';

export function boardRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', requireSignIn, async (req, res) => {
    const { json, etag } = await stockBoardJson(ctx, actorOf(req));
    res.set('ETag', etag).type('application/json').send(json);
  });
  router.get('/history', requireSignIn, async (req, res) => {
    res.json(await boardHistory(ctx, actorOf(req), 14));
  });
  return router;
}
