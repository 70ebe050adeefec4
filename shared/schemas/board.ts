import type { TankContents } from './tanks';

/** Stock of one kind of contents: litres from each tank's latest reading. */
export interface ContentsTotal {
  contents: TankContents;
  grossL: number;
  usableL: number;
  capacityL: number;
  /** Gross as a percentage of the capacity of the tanks that have a reading. */
  percentFull: number;
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
  lowStockL: number;
  grossL: number | null;
  usableL: number | null;
  percentFull: number | null;
  temperatureC: number | null;
  takenAt: string | null;
  low: boolean;
  /** Mean use over the last two weeks (L/day); null before there is enough history. */
  useLPerDay: number | null;
  /** Usable volume over the use rate (days); null when no use was seen. */
  daysOfCover: number | null;
}

/** One farm on the board. */
export interface FarmBoard {
  farmId: number;
  name: string;
  totals: ContentsTotal[];
  tanks: TankTile[];
}

/** GET /api/board (the socket event `board:farms` carries the changed farms' `FarmBoard`s). */
export interface StockBoard {
  generatedAt: string;
  totals: ContentsTotal[];
  farms: FarmBoard[];
}

/** GET /api/board/history: usable litres per contents per local day. */
export interface BoardHistory {
  days: string[];
  series: { contents: TankContents; usableL: (number | null)[] }[];
}
