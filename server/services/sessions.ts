// Session rows that can no longer sign anyone in are deleted on a timer: idle past their expiry,
// or older than the absolute limit (a session row is made at sign-in, so createdAt is its start).
import { Op } from 'sequelize';
import type { AppContext } from '../context';

/** Deletes every dead session row; returns how many went. */
export async function purgeExpiredSessions(ctx: AppContext, now = new Date()): Promise<number> {
  const oldest = new Date(now.getTime() - ctx.config.session.absoluteMs);
  return ctx.db.models.Session.destroy({ where: { [Op.or]: [{ expires: { [Op.lt]: now } }, { createdAt: { [Op.lt]: oldest } }] } });
}

/** Purges every `config.session.purgeMs`; returns the function that stops it. */
export function startSessionPurge(ctx: AppContext): () => void {
  const timer = setInterval(() => {
    purgeExpiredSessions(ctx)
      .then((n) => n && ctx.logger.info(`${n} expired session(s) removed`))
      .catch((err) => ctx.logger.warn({ err }, 'removing expired sessions failed; trying again later'));
  }, ctx.config.session.purgeMs);
  timer.unref();
  return () => clearInterval(timer);
}
