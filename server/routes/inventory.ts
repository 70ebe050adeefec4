import { Router } from 'express';
import { z } from 'zod';
import {
  idSchema, inputCreateSchema, inputListQuerySchema, inputUpdateSchema, movementCreateSchema, orderCloseShortSchema, orderCreateSchema, orderFromSuggestionsSchema, orderReceiptSchema,
  orderUpdateSchema, ORDER_STATUSES, supplierCreateSchema, supplierUpdateSchema,
} from '@shared/schemas';
import type { AppContext } from '../context';
import { actorOf, requireRole, requireSignIn } from '../middleware/access';
import {
  cancelOrder, closeOrderShort, createInput, createOrder, createSupplier, getInput, getOrder, inputsCsv, listInputs, listMovements, listOrders, listSuppliers, ordersCsv,
  ordersFromSuggestions, receiveOrder, recordMovement, sendOrder, updateInput, updateOrder, updateSupplier,
} from '../services/inventory';
import { idParam, parse } from '../validate';

const orderListQuery = z.object({ status: z.enum(ORDER_STATUSES).optional(), farmId: idSchema.optional(), format: z.enum(['json', 'csv']).default('json') });

// Buyers keep inputs stocked; managers and owners may do all of it; workers record use and counts.
const purchasing = requireRole('owner', 'manager', 'buyer');

/** Mounted at /suppliers. */
export function suppliersRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', requireSignIn, async (req, res) => void res.json(await listSuppliers(ctx, actorOf(req))));
  router.post('/', purchasing, async (req, res) => void res.status(201).json(await createSupplier(ctx, actorOf(req), parse(supplierCreateSchema, req.body))));
  router.patch('/:id', purchasing, async (req, res) => void res.json(await updateSupplier(ctx, actorOf(req), idParam(req.params.id, 'Supplier'), parse(supplierUpdateSchema, req.body))));
  return router;
}

/** Mounted at /inputs: inputs, their stock and movements. */
export function inputsRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', requireSignIn, async (req, res) => {
    const q = parse(inputListQuerySchema, req.query);
    if (q.format === 'csv') return void res.type('text/csv').attachment('inputs.csv').send(await inputsCsv(ctx, actorOf(req), q));
    res.json(await listInputs(ctx, actorOf(req), q));
  });
  router.get('/:id', requireSignIn, async (req, res) => void res.json(await getInput(ctx, actorOf(req), idParam(req.params.id, 'Input'))));
  router.post('/', purchasing, async (req, res) => void res.status(201).json(await createInput(ctx, actorOf(req), parse(inputCreateSchema, req.body))));
  router.patch('/:id', purchasing, async (req, res) => void res.json(await updateInput(ctx, actorOf(req), idParam(req.params.id, 'Input'), parse(inputUpdateSchema, req.body))));
  router.get('/:id/movements', requireSignIn, async (req, res) => void res.json(await listMovements(ctx, actorOf(req), idParam(req.params.id, 'Input'))));
  router.post('/:id/movements', requireSignIn, async (req, res) => void res.status(201).json(await recordMovement(ctx, actorOf(req), idParam(req.params.id, 'Input'), parse(movementCreateSchema, req.body))));
  return router;
}

/** Mounted at /orders: purchase orders from draft to received. */
export function ordersRouter(ctx: AppContext) {
  const router = Router();
  router.get('/', purchasing, async (req, res) => {
    const q = parse(orderListQuery, req.query);
    if (q.format === 'csv') return void res.type('text/csv').attachment('orders.csv').send(await ordersCsv(ctx, actorOf(req), q));
    res.json(await listOrders(ctx, actorOf(req), q));
  });
  router.get('/:id', purchasing, async (req, res) => void res.json(await getOrder(ctx, actorOf(req), idParam(req.params.id, 'Order'))));
  router.post('/', purchasing, async (req, res) => void res.status(201).json(await createOrder(ctx, actorOf(req), parse(orderCreateSchema, req.body))));
  router.post('/from-suggestions', purchasing, async (req, res) => void res.status(201).json(await ordersFromSuggestions(ctx, actorOf(req), parse(orderFromSuggestionsSchema, req.body))));
  router.patch('/:id', purchasing, async (req, res) => void res.json(await updateOrder(ctx, actorOf(req), idParam(req.params.id, 'Order'), parse(orderUpdateSchema, req.body))));
  router.post('/:id/send', purchasing, async (req, res) => void res.json(await sendOrder(ctx, actorOf(req), idParam(req.params.id, 'Order'))));
  router.post('/:id/cancel', purchasing, async (req, res) => void res.json(await cancelOrder(ctx, actorOf(req), idParam(req.params.id, 'Order'))));
  router.post('/:id/close-short', purchasing, async (req, res) => void res.json(await closeOrderShort(ctx, actorOf(req), idParam(req.params.id, 'Order'), parse(orderCloseShortSchema, req.body))));
  router.post('/:id/receipts', purchasing, async (req, res) => void res.json(await receiveOrder(ctx, actorOf(req), idParam(req.params.id, 'Order'), parse(orderReceiptSchema, req.body))));
  return router;
}
