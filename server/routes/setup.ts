import { Router } from 'express';
import { firstOwnerSchema } from '@shared/schemas';
import { clusterOf } from '../cluster';
import type { AppContext } from '../context';
import { authLimits } from '../middleware/rate-limits';
import type { CsrfTools } from '../middleware/security';
import { assertSetupOpen, createFirstOwner, setupState } from '../services/first-owner';
import { parse } from '../validate';
import { startSession } from './auth';

/** The first-owner set-up of a server with no organisation; public, like sign-in. */
export function setupRouter(ctx: AppContext, csrf: CsrfTools) {
  const router = Router();
  const { perIp } = authLimits(ctx.config, clusterOf(ctx).limitStoreFor);

  router.get('/', async (_req, res) => {
    res.json(await setupState(ctx));
  });

  router.post('/first-owner', perIp, async (req, res) => {
    // Closed for good once an organisation exists, before the body is even read.
    await assertSetupOpen(ctx);
    const input = parse(firstOwnerSchema, req.body);
    const owner = await createFirstOwner(ctx, input);
    res.json(await startSession(ctx, req, res, csrf, owner.id));
  });

  return router;
}
