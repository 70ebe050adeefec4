import { z } from 'zod';
import { GAUGE_PAPERS } from '../gauge/index';
import { UNIT_SYSTEMS } from './common';

/**
 * Query of GET /api/tanks/:id/gauge-strip.pdf: a mark every `every` litres (unit=metric) or US gallons
 * (unit=us); left out, `every` is the suggested round step, `unit` the user's own and `paper` A4
 * (Letter for US units).
 */
export const gaugeStripQuerySchema = z.object({
  every: z.coerce
    .number({ error: 'must be a number' })
    .finite('must be a finite number')
    .positive('must be greater than 0')
    .max(10_000_000, 'must be at most 10,000,000')
    .optional(),
  unit: z.enum(UNIT_SYSTEMS, { error: 'must be metric or us' }).optional(),
  paper: z.enum(GAUGE_PAPERS, { error: 'must be a4 or letter' }).optional(),
  /** label=true prints the tank's label beside the strip (or on a page after it when there is no room). */
  label: z.enum(['true', 'false'], { error: 'must be true or false' }).optional(),
});
/** The parsed gauge-strip query (every in the unit system's volume unit). */
export type GaugeStripQuery = z.infer<typeof gaugeStripQuerySchema>;

/** Query of GET /api/tanks/:id/label.pdf: capacities in `unit` (left out, the user's own). */
export const tankLabelQuerySchema = z.object({
  unit: z.enum(UNIT_SYSTEMS, { error: 'must be metric or us' }).optional(),
});
/** The parsed tank-label query. */
export type TankLabelQuery = z.infer<typeof tankLabelQuerySchema>;

/** Query of GET /api/farms/:id/labels.pdf: a sheet of labels on `paper` (left out, A4, or Letter for US units). */
export const farmLabelsQuerySchema = tankLabelQuerySchema.extend({
  paper: z.enum(GAUGE_PAPERS, { error: 'must be a4 or letter' }).optional(),
});
/** The parsed farm-labels query. */
export type FarmLabelsQuery = z.infer<typeof farmLabelsQuerySchema>;
