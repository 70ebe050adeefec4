import { Router } from 'express';
import type { AppContext } from '../context';
import { actorOf, requireSignIn } from '../middleware/access';
import { replicaReads } from '../middleware/replica-reads';
import { boardHistory, gzippedBoard, stockBoardJson } from '../services/board';
import { recordTiming } from '../timings';

export function boardRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', requireSignIn, replicaReads(), async (req, res) => {
    // Request in to answer written, as the server sees it (the board bench reads these beside its client's figures).
    const startedAt = performance.now();
    res.once('finish', () => recordTiming(ctx, 'board-request', performance.now() - startedAt));
    const board = await stockBoardJson(ctx, actorOf(req));
    res.set('Vary', 'Accept-Encoding').type('application/json');
    // The kept copy is gzipped once (its own entity tag); the compression middleware leaves an encoded body alone.
    if (req.acceptsEncodings('gzip', 'identity') === 'gzip') res.set({ ETag: board.etag.replace(/"$/, '-gz"'), 'Content-Encoding': 'gzip' }).send(await gzippedBoard(board));
    else res.set('ETag', board.etag).send(board.json);
  });
  router.get('/history', requireSignIn, replicaReads(), async (req, res) => {
    res.json(await boardHistory(ctx, actorOf(req), 14));
  });
  return router;
}
