import { z } from 'zod';
import { idSchema } from './common';
import type { CheckProblem } from '../check-problems';

/** Where a reading came from. */
export const READING_SOURCES = ['round', 'logger', 'correction'] as const;
/** A reading source. */
export type ReadingSource = (typeof READING_SOURCES)[number];

const temperatureC = z.number({ error: 'must be a number' }).finite().min(-40, 'must be -40 °C or more').max(90, 'must be 90 °C or less');

/** One tank's line of a submitted round: the sight-tube reading in mm (the client converts from the user's unit). */
export const roundEntrySchema = z.object({
  tankId: idSchema,
  readingMm: z.number({ error: 'must be a number' }).finite().min(-30_000).max(30_000),
  temperatureC: temperatureC.nullable().optional(),
  note: z.string().trim().max(300).default(''),
  /** Made by the client once per entry, so a retried submit never stores a reading twice. */
  idempotencyKey: z.string().trim().min(8).max(64).regex(/^[A-Za-z0-9_-]+$/, 'letters, digits, _ and - only'),
});
export type RoundEntry = z.infer<typeof roundEntrySchema>;

/** Body of POST /api/rounds. */
export const roundSubmitSchema = z.object({
  farmId: idSchema,
  /** When the round was walked; defaults to now. Never in the future. */
  takenAt: z.iso.datetime({ offset: true, error: 'must be an ISO 8601 date-time with offset' }).optional(),
  entries: z.array(roundEntrySchema).min(1, 'enter at least one tank').max(500),
});
export type RoundSubmitInput = z.infer<typeof roundSubmitSchema>;

/**
 * What happened to one line of a round: stored; stored before under the sender's key (duplicate);
 * refused with a reason; or not stored because another reading of the tank holds the same instant
 * (conflict, with a reason naming the tank; sending it again at a new time stores it).
 */
export interface RoundEntryResult {
  tankId: number;
  status: 'stored' | 'duplicate' | 'refused' | 'conflict';
  reason?: string;
  /** A reading the tank refuses: the reason as a code of message area `checks`, for screens in other languages. */
  problem?: CheckProblem;
  reading?: Reading;
}

/** POST /api/rounds: what happened to each entry, in the order sent (201 when any was stored, else 200). */
export interface RoundSubmitAnswer {
  results: RoundEntryResult[];
}

/** Body of POST /api/readings/:id/correction: the right value and why. */
export const correctionSchema = z
  .object({
    readingMm: z.number().finite().min(-30_000).max(30_000).optional(),
    levelMm: z.number().finite().min(0).max(30_000).optional(),
    temperatureC: temperatureC.nullable().optional(),
    note: z.string().trim().min(3, 'say why the reading was wrong').max(300),
  })
  .refine((c) => c.readingMm !== undefined || c.levelMm !== undefined, { message: 'give the corrected tube reading or level', path: ['readingMm'] });
export type CorrectionInput = z.infer<typeof correctionSchema>;

/** A stored reading. Volumes in L, level in mm above the tank floor. */
export interface Reading {
  id: number;
  tankId: number;
  takenAt: string;
  levelMm: number;
  grossL: number;
  usableL: number;
  temperatureC: number | null;
  source: ReadingSource;
  enteredBy: string;
  importId: number | null;
  note: string;
  calibrationVersion: string;
  /** Set when a later correction replaced this reading. */
  correctedById: number | null;
  /** The reading this one corrects. */
  correctsId: number | null;
}

/** Query of GET /api/tanks/:id/readings. */
export const readingsQuerySchema = z.object({
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(200),
});

/** Query of GET /api/tanks/:id/series. */
export const seriesQuerySchema = z.object({
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  bucket: z.enum(['raw', 'hour', 'day', 'week']).default('raw'),
});

/** One point of a level / volume series (bucketed series: the bucket's last reading). */
export interface SeriesPoint {
  t: string;
  levelMm: number;
  grossL: number;
  usableL: number;
  temperatureC: number | null;
}
