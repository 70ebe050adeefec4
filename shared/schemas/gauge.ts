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
});
/** The parsed gauge-strip query (every in the unit system's volume unit). */
export type GaugeStripQuery = z.infer<typeof gaugeStripQuerySchema>;
