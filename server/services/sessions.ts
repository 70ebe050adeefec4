// Session rows that can no longer sign anyone in are deleted on a timer: idle past their expiry,
// or older than the absolute limit (a session row is made at sign-in, so createdAt is its start).
// With several server processes one of them purges each period (server/cluster/periodic-job.ts), and
// the deletion drops every process's kept sessions through the bus (services/signed-in-cache.ts).
import { Op } from 'sequelize';
import { startPeriodicJob } from '../cluster/periodic-job';
import type { AppContext } from '../context';

/** Deletes every dead session row; returns how many went. */
export async function purgeExpiredSessions(ctx: AppContext, now = new Date()): Promise<number> {
  const oldest = new Date(now.getTime() - ctx.config.session.absoluteMs);
  return ctx.db.models.Session.destroy({ where: { [Op.or]: [{ expires: { [Op.lt]: now } }, { createdAt: { [Op.lt]: oldest } }] } });
}

/** Purges every `config.session.purgeMs`, in one process of several; returns the function that stops it. */
export function startSessionPurge(ctx: AppContext): () => void {
  return startPeriodicJob(ctx, {
    name: 'session-purge',
    periodMs: ctx.config.session.purgeMs,
    work: async () => {
      const n = await purgeExpiredSessions(ctx);
      if (n) ctx.logger.info(`${n} expired session(s) removed`);
    },
  });
}
