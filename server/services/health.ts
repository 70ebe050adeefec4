// Whether the database answers, for GET /api/health: a hung database counts as down after a bound.
import { QueryTypes } from 'sequelize';
import type { AppContext } from '../context';

/** The health answer waits at most this long for the database; a database that hangs counts as down. */
export const HEALTH_DB_TIMEOUT_MS = 2_000;

/** Resolves true when MariaDB answers a trivial SELECT within HEALTH_DB_TIMEOUT_MS, false otherwise (and logs why). */
export async function databaseAnswers(ctx: AppContext): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  try {
    const late = new Promise<never>((_, reject) => {
      timer = setTimeout(() => reject(new Error(`no answer from the database in ${HEALTH_DB_TIMEOUT_MS} ms`)), HEALTH_DB_TIMEOUT_MS);
    });
    // A typed SELECT: sequelize's raw-result path trips over the mariadb connector's read-only `meta`.
    await Promise.race([ctx.db.sequelize.query('SELECT 1 AS up', { type: QueryTypes.SELECT }), late]);
    return true;
  } catch (err) {
    ctx.logger.warn({ err }, 'health check: database not reachable');
    return false;
  } finally {
    clearTimeout(timer);
  }
}
