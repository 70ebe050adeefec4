// The figures a tank's stock is shown with, the same on the round, the stock board, the farm and
// tank pages: usable litres as the main figure, the litres in the tank as the secondary one, and a
// percentage that says what it is of (the usable capacity, from the outlet to the safe fill line).
import { tankModel, type TankGeometry } from '../calibration/index';
import type { TankLevels } from './volumes';

/** A tank's stock as every screen shows it; litres and a percentage. */
export interface StockFigures {
  /** The main figure: litres above the outlet, the ones that can be drawn off. */
  usableL: number;
  /** The secondary figure: all the liquid in the tank, the volume under the outlet included. */
  totalL: number;
  /** What the percentage is of: the litres between the outlet and the safe fill line. */
  usableCapacityL: number;
  /** usableL as a percentage of usableCapacityL (over 100 when filled past the safe fill line); null when that capacity is 0. */
  percentOfUsableCapacity: number | null;
}

const within = (v: number, top: number) => (v < 0 ? 0 : v > top ? top : v);

/** The usable capacity in litres: the volume between the outlet and the safe fill line (0 when the line is not above the outlet). */
export function usableCapacityL(geometry: TankGeometry, levels: TankLevels): number {
  const model = tankModel(geometry);
  const top = model.heightMm;
  return Math.max(0, model.volumeL(within(levels.safeFillLevelMm, top)) - model.volumeL(within(levels.outletHeightMm, top)));
}

/** The figures shown for a tank's stock (L, %): usable litres first, litres in the tank second, and usable litres as a percentage of the usable capacity. */
export function stockFigures(volumes: { grossL: number; usableL: number }, capacityL: number): StockFigures {
  return {
    usableL: volumes.usableL,
    totalL: volumes.grossL,
    usableCapacityL: capacityL,
    percentOfUsableCapacity: capacityL > 0 ? (volumes.usableL / capacityL) * 100 : null,
  };
}
