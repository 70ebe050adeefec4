import { Router } from 'express';
import { QueryTypes } from 'sequelize';
import type { AppContext } from '../context';

/** The health answer waits at most this long for the database; a database that hangs counts as down. */
export const HEALTH_DB_TIMEOUT_MS = 2_000;

export function healthRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', async (_req, res) => {
    let timer: NodeJS.Timeout | undefined;
    try {
      const late = new Promise<never>((_, reject) => {
        timer = setTimeout(() => reject(new Error(`no answer from the database in ${HEALTH_DB_TIMEOUT_MS} ms`)), HEALTH_DB_TIMEOUT_MS);
      });
      // A typed SELECT: sequelize's raw-result path trips over the mariadb connector's read-only `meta`.
      await Promise.race([ctx.db.sequelize.query('SELECT 1 AS up', { type: QueryTypes.SELECT }), late]);
      res.json({ status: 'ok', database: 'up' });
    } catch (err) {
      ctx.logger.warn({ err }, 'health check: database not reachable');
      res.status(503).json({ status: 'degraded', database: 'down' });
    } finally {
      clearTimeout(timer);
    }
  });
  return router;
}
