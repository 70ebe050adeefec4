import { Router } from 'express';
import { QueryTypes } from 'sequelize';
import type { AppContext } from '../context';

export function healthRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', async (_req, res) => {
    try {
      // A typed SELECT: sequelize's raw-result path trips over the mariadb connector's read-only `meta`.
      await ctx.db.sequelize.query('SELECT 1 AS up', { type: QueryTypes.SELECT });
      res.json({ status: 'ok', database: 'up' });
    } catch (err) {
      ctx.logger.warn({ err }, 'health check: database not reachable');
      res.status(503).json({ status: 'degraded', database: 'down' });
    }
  });
  return router;
}
