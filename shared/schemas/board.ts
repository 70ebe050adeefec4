import type { BoardStreamPosition } from './board-delta';
import type { TankContents } from './tanks';

/** Stock of one kind of contents: litres from each tank's latest reading. */
export interface ContentsTotal {
  contents: TankContents;
  grossL: number;
  usableL: number;
  capacityL: number;
  /** The usable capacity (outlet to safe fill line) of the tanks that have a reading (L). */
  usableCapacityL: number;
  /** usableL as a percentage of usableCapacityL (shared/readings stockFigures); null when none of the tanks has one. */
  percentOfUsableCapacity: number | null;
  tanks: number;
  tanksWithoutReading: number;
  /** The oldest latest-reading behind this total (how stale the figure can be). */
  oldestReadingAt: string | null;
}

/** One tank's tile on the stock board. */
export interface TankTile {
  tankId: number;
  farmId: number;
  name: string;
  code: string;
  contents: TankContents;
  capacityL: number;
  /** Litres between the outlet and the safe fill line: what percentOfUsableCapacity is of. */
  usableCapacityL: number;
  lowStockL: number;
  grossL: number | null;
  usableL: number | null;
  /** usableL as a percentage of usableCapacityL (shared/readings stockFigures); null without a reading. */
  percentOfUsableCapacity: number | null;
  /** Level of the latest reading above the floor (mm); null without a reading. */
  levelMm: number | null;
  /** The tank's inside height, the sight tube's zero mark, the outlet and the safe fill line, mm above the floor (for the sight-tube glyph). */
  heightMm: number;
  datumOffsetMm: number;
  outletHeightMm: number;
  safeFillLevelMm: number;
  temperatureC: number | null;
  takenAt: string | null;
  low: boolean;
  /** Mean use over the last two weeks (L/day); null before there is enough history. */
  useLPerDay: number | null;
  /** Days the usable volume lasts from now at the use rate, counted on from the reading (shared/forecast daysOfCoverSince); null when no use was seen. */
  daysOfCover: number | null;
}

/** One farm on the board. */
export interface FarmBoard {
  farmId: number;
  name: string;
  totals: ContentsTotal[];
  tanks: TankTile[];
}

/** The board's figures, as read from the database. */
export interface BoardSnapshot {
  generatedAt: string;
  totals: ContentsTotal[];
  farms: FarmBoard[];
}

/** GET /api/board: the figures and the position of the farm set's delta stream they include (socket event `board:delta` carries what changes after it). */
export interface StockBoard extends BoardSnapshot {
  stream: BoardStreamPosition;
}

/** A farm on the board history: whose local days its tanks' figures follow. */
export interface BoardHistoryFarm {
  farmId: number;
  name: string;
  /** The IANA time zone whose midnights start and end this farm's days. */
  timeZone: string;
  /** The farm's local date now ('YYYY-MM-DD'). */
  today: string;
}

/**
 * GET /api/board/history: usable litres per contents per farm-local day. `days` are calendar dates
 * ('YYYY-MM-DD'), each farm's figures taken from its own local day; they end at the latest `today`
 * of the farms, and a farm not yet at a date counts its latest value there.
 */
export interface BoardHistory {
  days: string[];
  farms: BoardHistoryFarm[];
  series: { contents: TankContents; usableL: (number | null)[] }[];
}
