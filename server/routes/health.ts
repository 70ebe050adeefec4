import { Router } from 'express';
import type { AppContext } from '../context';
import { databaseAnswers } from '../services/health';

export function healthRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', async (_req, res) => {
    if (await databaseAnswers(ctx)) res.json({ status: 'ok', database: 'up' });
    else res.status(503).json({ status: 'degraded', database: 'down' });
  });
  return router;
}
