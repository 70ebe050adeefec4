import { Router } from 'express';
import type { OutboxList } from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole } from '../middleware/access';
import { clearOutboxOf, listOutbox, listOutboxTexts, outboxAttachment } from '../services/outbox';
import { notFound } from '../errors';

const MAIL_ID = /^[0-9A-Za-z-]+$/;

/** Development-only: the mail the local capture receiver caught and the texts the SMS fake received. Mounted only when DEV_OUTBOX is on
 * and never in production (server/config.ts); each person sees their own organisation's mail only. */
export function devRouter(ctx: AppContext) {
  const router = Router();
  const readers = requireRole('owner', 'manager', 'buyer');
  router.get('/outbox', readers, async (req, res) => {
    const actor = actorOf(req);
    res.json({ messages: await listOutbox(ctx, actor), texts: await listOutboxTexts(ctx, actor) } satisfies OutboxList);
  });
  router.get('/outbox/:id/attachments/:index', readers, async (req, res) => {
    const id = String(req.params.id);
    const index = Number(req.params.index);
    if (!MAIL_ID.test(id) || !Number.isInteger(index) || index < 0) throw notFound('Mail attachment');
    const file = await outboxAttachment(ctx, actorOf(req), id, index);
    res.attachment(file.filename).type(file.contentType).send(file.content);
  });
  router.delete('/outbox', requireRole('owner', 'manager'), async (req, res) => {
    await clearOutboxOf(ctx, actorOf(req));
    res.status(204).end();
  });
  return router;
}
