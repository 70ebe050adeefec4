import { Router } from 'express';
import { farmCreateSchema, farmLabelsQuerySchema, farmUpdateSchema } from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole, requireSignIn } from '../middleware/access';
import { createFarm, getFarm, listFarms, updateFarm } from '../services/farms';
import { farmFrostOf } from '../services/frost';
import { farmLabelsPdf } from '../services/tank-label-sheet';
import { idParam, parse } from '../validate';

export function farmsRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', requireSignIn, async (req, res) => {
    res.json(await listFarms(ctx, actorOf(req), { includeArchived: req.query.includeArchived === 'true' }));
  });
  router.get('/:id', requireSignIn, async (req, res) => {
    res.json(await getFarm(ctx, actorOf(req), idParam(req.params.id, 'Farm')));
  });
  router.get('/:id/labels.pdf', requireSignIn, async (req, res) => {
    const q = parse(farmLabelsQuerySchema, req.query);
    const { filename, pdf } = await farmLabelsPdf(ctx, actorOf(req), idParam(req.params.id, 'Farm'), q);
    // The file name is made of ASCII letters, digits and "-" only (slug of the farm's name).
    res.type('application/pdf').set('Content-Disposition', `attachment; filename="${filename}"`).send(Buffer.from(pdf));
  });
  router.get('/:id/frost', requireSignIn, async (req, res) => {
    res.json(await farmFrostOf(ctx, actorOf(req), idParam(req.params.id, 'Farm')));
  });
  router.post('/', requireRole('owner', 'manager'), async (req, res) => {
    res.status(201).json(await createFarm(ctx, actorOf(req), parse(farmCreateSchema, req.body)));
  });
  router.patch('/:id', requireRole('owner', 'manager'), async (req, res) => {
    res.json(await updateFarm(ctx, actorOf(req), idParam(req.params.id, 'Farm'), parse(farmUpdateSchema, req.body)));
  });
  return router;
}
