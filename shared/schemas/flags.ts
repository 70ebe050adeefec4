import { z } from 'zod';
import { idSchema } from './common';

/** Kinds of flag, in our own words: things that need a person. */
export const FLAG_KINDS = ['low-stock', 'reorder-due', 'suspected-leak', 'stale-tank', 'cold-culture', 'frost-risk', 'frost-ahead', 'overfill'] as const;
/** A flag kind. */
export type FlagKind = (typeof FLAG_KINDS)[number];

/** Where a flag stands: raised and waiting, seen by someone, or over (its condition ended). */
export const FLAG_STATUSES = ['open', 'acknowledged', 'cleared'] as const;
/** A flag status. */
export type FlagStatus = (typeof FLAG_STATUSES)[number];

/** A flag as the API returns it. */
export interface Flag {
  id: number;
  farmId: number;
  farmName: string;
  kind: FlagKind;
  subjectType: 'tank' | 'input';
  subjectId: number;
  subjectName: string;
  status: FlagStatus;
  /** What is wrong, in a sentence with its figures. */
  message: string;
  /** The figure behind it (°C, L, days…), for sorting and charts. */
  value: number | null;
  raisedAt: string;
  lastSeenAt: string;
  acknowledgedAt: string | null;
  acknowledgedBy: string | null;
  ackNote: string | null;
  clearedAt: string | null;
  /** Who cleared it by hand (null: it ended with its condition). */
  clearedBy: string | null;
  /** Why it was cleared by hand. */
  clearNote: string | null;
}

/** Query of GET /api/flags. */
export const flagListQuerySchema = z.object({
  status: z.enum(['active', 'open', 'acknowledged', 'cleared', 'all']).default('active'),
  farmId: idSchema.optional(),
  kind: z.enum(FLAG_KINDS).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(200),
});

/** Body of POST /api/flags/:id/acknowledge. */
export const flagAckSchema = z.object({ note: z.string().trim().min(2, 'say what was done or planned').max(300) });

/** Body of POST /api/flags/:id/clear: a person ends a temperature flag by hand, saying why. */
export const flagClearSchema = z.object({ note: z.string({ error: 'say why the flag is over' }).trim().min(2, 'say why the flag is over').max(300) });
