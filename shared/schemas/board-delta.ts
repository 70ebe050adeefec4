// The live board's socket messages, as zod schemas: the server's socket.io `Server` and the client's
// `Socket` take their event maps from here, and the client checks each board delta against its schema
// before applying it. A delta carries, numbered per farm set, only what changed of each tank tile
// (a tile new to the board whole); the totals, of a farm and across the set, are worked out from the
// tiles by the receiver with the same shared function the server uses (shared/board).
import { z } from 'zod';
import type { ContentsTotal, TankTile } from './board';
import { FLAG_KINDS, FLAG_STATUSES, type Flag } from './flags';
import { IMPORT_STATUSES, type ImportProgress } from './imports';
import { TANK_CONTENTS } from './tanks';

/** The delta format's version: a client that meets another one fetches the board instead (2: tiles as changed fields, no totals). */
export const BOARD_DELTA_VERSION = 2;

const isoInstant = z.string();

/** One tank's tile, as in GET /api/board. */
export const tankTileSchema = z.object({
  tankId: z.number().int(),
  farmId: z.number().int(),
  name: z.string(),
  code: z.string(),
  contents: z.enum(TANK_CONTENTS),
  capacityL: z.number(),
  usableCapacityL: z.number(),
  lowStockL: z.number(),
  grossL: z.number().nullable(),
  usableL: z.number().nullable(),
  percentOfUsableCapacity: z.number().nullable(),
  levelMm: z.number().nullable(),
  heightMm: z.number(),
  datumOffsetMm: z.number(),
  outletHeightMm: z.number(),
  safeFillLevelMm: z.number(),
  temperatureC: z.number().nullable(),
  takenAt: isoInstant.nullable(),
  low: z.boolean(),
  useLPerDay: z.number().nullable(),
  daysOfCover: z.number().nullable(),
});

/** Stock of one kind of contents, as in GET /api/board. */
export const contentsTotalSchema = z.object({
  contents: z.enum(TANK_CONTENTS),
  grossL: z.number(),
  usableL: z.number(),
  capacityL: z.number(),
  usableCapacityL: z.number(),
  percentOfUsableCapacity: z.number().nullable(),
  tanks: z.number().int(),
  tanksWithoutReading: z.number().int(),
  oldestReadingAt: isoInstant.nullable(),
});

/** Where a farm set's stream stands: the server process's stream (epoch) and the last delta numbered in it. */
export const boardStreamSchema = z.object({
  version: z.number().int(),
  epoch: z.string().min(1),
  seq: z.number().int().min(0),
});
/** A farm set's stream position: sent on each (re)connection and inside GET /api/board. */
export type BoardStreamPosition = z.infer<typeof boardStreamSchema>;

/**
 * What changed of one tank's tile: its id and the fields whose value changed since the last delta
 * (every field when the tile is new to the board).
 */
export const tankTilePatchSchema = tankTileSchema.partial().extend({ tankId: z.number().int() });
/** One tile's change in a board delta. */
export type TankTilePatch = z.infer<typeof tankTilePatchSchema>;

/** What changed on one farm: its name, what changed of its tiles, the tanks that left it. */
export const farmDeltaSchema = z.object({
  farmId: z.number().int(),
  name: z.string(),
  tanks: z.array(tankTilePatchSchema),
  removedTankIds: z.array(z.number().int()),
});
/** One farm's part of a board delta. */
export type FarmDelta = z.infer<typeof farmDeltaSchema>;

/** Socket event `board:delta`: the next numbered change of a farm set's board. */
export const boardDeltaSchema = boardStreamSchema.extend({
  generatedAt: isoInstant,
  farms: z.array(farmDeltaSchema),
  /** Farms that left the board (archived, or their last tank archived). */
  removedFarmIds: z.array(z.number().int()),
});
/** A board delta. */
export type BoardDelta = z.infer<typeof boardDeltaSchema>;

/** A flag as the API returns it (socket event `flags:farm` carries a farm's active ones). */
export const flagSchema = z.object({
  id: z.number().int(),
  farmId: z.number().int(),
  farmName: z.string(),
  kind: z.enum(FLAG_KINDS),
  subjectType: z.enum(['tank', 'input']),
  subjectId: z.number().int(),
  subjectName: z.string(),
  status: z.enum(FLAG_STATUSES),
  message: z.string(),
  value: z.number().nullable(),
  raisedAt: isoInstant,
  lastSeenAt: isoInstant,
  acknowledgedAt: isoInstant.nullable(),
  acknowledgedBy: z.string().nullable(),
  ackNote: z.string().nullable(),
  clearedAt: isoInstant.nullable(),
  clearedBy: z.string().nullable(),
  clearNote: z.string().nullable(),
});

/** Socket event `flags:farm`: every active flag of one farm, replacing the last push. */
export const flagsFarmPushSchema = z.object({ farmId: z.number().int(), flags: z.array(flagSchema) });

/** Socket event `import:progress`, to the uploader only. */
export const importProgressSchema = z.object({
  importId: z.number().int(),
  rowsRead: z.number().int(),
  bytesRead: z.number(),
  totalBytes: z.number(),
  status: z.enum(IMPORT_STATUSES),
});

/** Every event the server sends over socket.io, by name. */
export const serverToClientSchemas = {
  'board:stream': boardStreamSchema,
  'board:delta': boardDeltaSchema,
  'flags:farm': flagsFarmPushSchema,
  'import:progress': importProgressSchema,
} as const;

/** socket.io's event map of the server's messages: one listener per event, its payload inferred from the schema. */
export type ServerToClientEvents = { [E in keyof typeof serverToClientSchemas]: (payload: z.infer<(typeof serverToClientSchemas)[E]>) => void };

/** The client sends nothing over the socket: what it sees is decided by the server from its session. */
export type ClientToServerEvents = Record<never, never>;

/** The payload of one server event. */
export type ServerEventPayload<E extends keyof ServerToClientEvents> = Parameters<ServerToClientEvents[E]>[0];

// The schemas and the API's interfaces describe the same objects: these fail to compile when they drift apart.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
type Holds<T extends true> = T;
/** Compile-time check only. */
export type SchemasMatchInterfaces = [
  Holds<Same<z.infer<typeof tankTileSchema>, TankTile>>,
  Holds<Same<z.infer<typeof contentsTotalSchema>, ContentsTotal>>,
  Holds<Same<z.infer<typeof flagSchema>, Flag>>,
  Holds<Same<z.infer<typeof importProgressSchema>, ImportProgress>>,
];
