import { Router } from 'express';
import { z } from 'zod';
import { calibrationQuerySchema, gaugeStripQuerySchema, idSchema, tankCreateSchema, tankLabelQuerySchema, tankUpdateSchema } from '@shared/schemas';
import type { AppContext } from '../context';
import { toCsv } from '../csv';
import { actorOf, requireRole, requireSignIn } from '../middleware/access';
import { gaugeStripPdf } from '../services/gauge-strip';
import { tankLabelPdf } from '../services/tank-labels';
import { calibrationTable, calibrationVersions } from '../services/tank-calibrations';
import { contentsHistory, createTank, listTanks, tankFor, toTankDto, updateTank } from '../services/tanks';
import { idParam, parse } from '../validate';
import { forecastFor } from '../services/forecasts';

const listQuery = z.object({ farmId: idSchema.optional(), includeArchived: z.enum(['true', 'false']).optional() });

export function tanksRouter(ctx: AppContext) {
  const router = Router();
  const managers = requireRole('owner', 'manager');

  router.get('/', requireSignIn, async (req, res) => {
    const q = parse(listQuery, req.query);
    res.json(await listTanks(ctx, actorOf(req), { farmId: q.farmId, includeArchived: q.includeArchived === 'true' }));
  });
  router.get('/:id', requireSignIn, async (req, res) => {
    res.json(toTankDto(await tankFor(ctx, actorOf(req), idParam(req.params.id, 'Tank'))));
  });
  router.post('/', managers, async (req, res) => {
    res.status(201).json(await createTank(ctx, actorOf(req), parse(tankCreateSchema, req.body)));
  });
  router.patch('/:id', managers, async (req, res) => {
    res.json(await updateTank(ctx, actorOf(req), idParam(req.params.id, 'Tank'), parse(tankUpdateSchema, req.body)));
  });
  router.get('/:id/forecast', requireSignIn, async (req, res) => {
    res.json(await forecastFor(ctx, actorOf(req), idParam(req.params.id, 'Tank')));
  });
  router.get('/:id/contents', requireSignIn, async (req, res) => {
    res.json(await contentsHistory(ctx, actorOf(req), idParam(req.params.id, 'Tank')));
  });
  router.get('/:id/calibrations', requireSignIn, async (req, res) => {
    res.json(await calibrationVersions(ctx, actorOf(req), idParam(req.params.id, 'Tank')));
  });
  router.get('/:id/calibration', requireSignIn, async (req, res) => {
    const q = parse(calibrationQuerySchema, req.query);
    const table = await calibrationTable(ctx, actorOf(req), idParam(req.params.id, 'Tank'), q);
    if (q.format === 'json') return void res.json(table);
    const tank = await tankFor(ctx, actorOf(req), table.tankId);
    // toCsv: no cell (the tank's name included) can run as a formula in a spreadsheet.
    const csv = toCsv(
      { fields: [`tube_reading_${table.lengthUnit}`, `level_above_floor_${table.lengthUnit}`, `volume_${table.volumeUnit}`], data: table.rows.map((r) => [round(r.reading), round(r.level), round(r.volume)]) },
    );
    const title = toCsv([[`# ${tank.name} (${tank.code})`], [`# calibration ${table.number} of ${table.calibratedAt.slice(0, 10)}`]]);
    res.type('text/csv').attachment(`${tank.code}-calibration.csv`).send(`${title}\r\n${csv}\r\n`);
  });
  router.get('/:id/gauge-strip.pdf', requireSignIn, async (req, res) => {
    const q = parse(gaugeStripQuerySchema, req.query);
    const { filename, pdf } = await gaugeStripPdf(ctx, actorOf(req), idParam(req.params.id, 'Tank'), q);
    // Tank codes are letters, digits and "-" only, so the name needs no escaping inside the quotes.
    res.type('application/pdf').set('Content-Disposition', `attachment; filename="${filename}"`).send(Buffer.from(pdf));
  });
  router.get('/:id/label.pdf', requireSignIn, async (req, res) => {
    const q = parse(tankLabelQuerySchema, req.query);
    const { filename, pdf } = await tankLabelPdf(ctx, actorOf(req), idParam(req.params.id, 'Tank'), q);
    res.type('application/pdf').set('Content-Disposition', `attachment; filename="${filename}"`).send(Buffer.from(pdf));
  });
  return router;
}

const round = (v: number) => Math.round(v * 1000) / 1000;
