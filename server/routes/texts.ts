import express, { Router } from 'express';
import type { AppContext } from '../context';
import { assertServiceSignature, handleInboundText, handleTextStatus } from '../services/flag-text-replies';

const fields = (body: unknown): Record<string, string> =>
  Object.fromEntries(Object.entries((body ?? {}) as Record<string, unknown>).filter((e): e is [string, string] => typeof e[1] === 'string'));

/**
 * Webhooks of the SMS service (form posts, no session or CSRF token: each is checked by the
 * service's signature instead). Mounted at /api/texts before the session middleware.
 */
export function textWebhooksRouter(ctx: AppContext) {
  const router = Router();
  router.use(express.urlencoded({ extended: false, limit: '64kb' }));
  router.post('/inbound', async (req, res) => {
    const params = fields(req.body);
    assertServiceSignature(ctx, '/api/texts/inbound', req.get('X-Twilio-Signature'), params);
    await handleInboundText(ctx, params);
    // The service reads the answer as its reply markup: an empty one sends nothing back.
    res.type('text/xml').send('<?xml version="1.0" encoding="UTF-8"?><Response></Response>');
  });
  router.post('/status', async (req, res) => {
    const params = fields(req.body);
    assertServiceSignature(ctx, '/api/texts/status', req.get('X-Twilio-Signature'), params);
    await handleTextStatus(ctx, params);
    res.status(204).end();
  });
  return router;
}
