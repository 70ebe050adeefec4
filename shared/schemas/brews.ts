import { z } from 'zod';
import { idSchema, text } from './common';

/** What a brew makes. */
export const BREW_KINDS = ['culture', 'fertilizer', 'pest-solution'] as const;
export type BrewKind = (typeof BREW_KINDS)[number];
/** Where a brew stands. */
export const BREW_STATUSES = ['brewing', 'ready', 'used-up', 'discarded'] as const;
export type BrewStatus = (typeof BREW_STATUSES)[number];

const isoInstant = z.iso.datetime({ offset: true, error: 'must be an ISO 8601 date-time with offset' });

/** Body of POST /api/brews; volumes in L, input quantities in each input's unit. */
export const brewCreateSchema = z.object({
  tankId: idSchema,
  kind: z.enum(BREW_KINDS),
  name: text(120),
  startedAt: isoInstant.optional(),
  readyAt: isoInstant.nullable().optional(),
  waterL: z.number({ error: 'must be a number' }).finite().min(0, 'must be 0 L or more').max(1_000_000),
  dilution: z.object({ n: z.number().finite().positive('must be greater than 0').max(1_000_000), convention: z.enum(['parts-water', 'parts-total']) }).nullable().default(null),
  notes: z.string().trim().max(1000).default(''),
  inputs: z.array(z.object({ inputId: idSchema, quantity: z.number({ error: 'must be a number' }).finite().positive('must be greater than 0').max(1_000_000) })).max(30).default([]),
});
export type BrewCreateInput = z.infer<typeof brewCreateSchema>;

/** Body of PATCH /api/brews/:id. */
export const brewUpdateSchema = z.object({ status: z.enum(BREW_STATUSES).optional(), readyAt: isoInstant.nullable().optional(), notes: z.string().trim().max(1000).optional() });
export type BrewUpdateInput = z.infer<typeof brewUpdateSchema>;

/** Body of POST /api/brews/:id/temperatures. */
export const brewTemperatureSchema = z.object({
  temperatureC: z.number({ error: 'must be a number' }).finite().min(-40, 'must be -40 °C or more').max(90, 'must be 90 °C or less'),
  at: isoInstant.optional(),
});

/** A brew as the API returns it. */
export interface Brew {
  id: number;
  farmId: number;
  farmName: string;
  tankId: number;
  tankName: string;
  tankCode: string;
  kind: BrewKind;
  name: string;
  status: BrewStatus;
  startedAt: string;
  readyAt: string | null;
  waterL: number;
  dilution: { n: number; convention: 'parts-water' | 'parts-total' } | null;
  notes: string;
  createdBy: string;
  inputs: { inputId: number; inputName: string; unit: string; quantity: number }[];
  temperatures: { at: string; temperatureC: number; source: 'brew' | 'reading' }[];
}

/** Query of GET /api/brews. */
export const brewListQuerySchema = z.object({ farmId: idSchema.optional(), tankId: idSchema.optional(), status: z.enum(BREW_STATUSES).optional() });
