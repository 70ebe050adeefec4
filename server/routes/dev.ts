import { Router } from 'express';
import type { AppContext } from '../context';
import { clearOutbox, readOutbox } from '../mail/capture';

/** Development-only: the mail the local capture receiver caught. Mounted only when DEV_OUTBOX is on
 * (never in production), open without sign-in so an invitee can follow their link on a dev machine. */
export function devRouter(ctx: AppContext) {
  const router = Router();
  router.get('/outbox', async (_req, res) => {
    res.json({ messages: await readOutbox(ctx.config.outboxDir) });
  });
  router.delete('/outbox', (_req, res) => {
    clearOutbox(ctx.config.outboxDir);
    res.status(204).end();
  });
  return router;
}
